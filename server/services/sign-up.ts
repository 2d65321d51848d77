/**
 * Sign-up in two steps, so the answer never tells whether an address has an account: the
 * request always hashes the password and queues one message, a confirmation link for a new
 * address or a note to the owner of a registered one; the account is made from the link.
 */
import type { H3Event } from 'h3'
import { and, eq, gt, isNull } from 'drizzle-orm'
import type { SignUpBody } from '#shared/schemas/account'
import type { User } from '../db/schema'
import { userById, userByEmail } from './accounts'
import { signUpConfirmMail, signUpTakenMail } from './mail-messages'

const CONFIRM_LINK_HOURS = 24
export const SIGN_UP_ACCEPTED = 'Check your e-mail: we sent a link to finish making the account.'

function isDuplicateEntry(error: unknown): boolean {
  const e = error as { code?: string, cause?: { code?: string } }
  return e?.code === 'ER_DUP_ENTRY' || e?.cause?.code === 'ER_DUP_ENTRY'
}

function confirmLink(token: string, next: string | undefined): string {
  const query = new URLSearchParams({ token })
  if (next) query.set('next', next)
  return publicUrl(`/sign-up/confirm?${query}`)
}

/** Queues the confirmation link (new address) or the owner's note (registered one); says nothing either way. */
export async function requestSignUp(body: SignUpBody): Promise<void> {
  // both paths hash, read the address and write in one transaction, so they take the same time
  const passwordHash = await hashPassword(body.password)
  const owner = await userByEmail(body.email)
  await useDB().transaction(async (tx) => {
    if (owner) {
      await queueMail(signUpTakenMail(owner.email, publicUrl('/sign-in'), publicUrl('/forgot')), tx)
      return
    }
    const token = newLinkToken()
    await tx.insert(tables.pendingSignUps).values({
      tokenHash: hashLinkToken(token),
      email: body.email,
      name: body.name,
      role: body.role,
      passwordHash,
      expiresAt: new Date(Date.now() + CONFIRM_LINK_HOURS * 3600_000),
    })
    await queueMail(signUpConfirmMail(body.email, body.name, confirmLink(token, body.next), CONFIRM_LINK_HOURS), tx)
  })
}

/** The same 404 for a wrong, used or expired link and for an address taken since: no discovery. */
function linkNotValid() {
  return createError({ statusCode: 404, statusMessage: 'This sign-up link has expired or was already used: make the account again' })
}

/** Makes the account from a confirmation link (single use, within 24 hours) and signs it in. */
export async function confirmSignUp(event: H3Event, token: string): Promise<User> {
  const { pendingSignUps, users } = tables
  const db = useDB()
  const [pending] = await db.select().from(pendingSignUps).where(and(
    eq(pendingSignUps.tokenHash, hashLinkToken(token)),
    isNull(pendingSignUps.usedAt),
    gt(pendingSignUps.expiresAt, new Date()),
  ))
  if (!pending) throw linkNotValid()
  let userId: number | undefined
  try {
    userId = await db.transaction(async (tx) => {
      // claiming the link in its own WHERE makes a second, concurrent use fail
      const [claim] = await tx.update(pendingSignUps)
        .set({ usedAt: new Date() })
        .where(and(eq(pendingSignUps.id, pending.id), isNull(pendingSignUps.usedAt)))
      if (claim.affectedRows !== 1) return undefined
      const [row] = await tx.insert(users)
        .values({ name: pending.name, email: pending.email, role: pending.role, passwordHash: pending.passwordHash })
        .$returningId()
      // other links for the same address die with this one
      await tx.update(pendingSignUps)
        .set({ usedAt: new Date() })
        .where(and(eq(pendingSignUps.email, pending.email), isNull(pendingSignUps.usedAt)))
      return row!.id
    })
  }
  catch (error) {
    if (isDuplicateEntry(error)) {
      await db.update(pendingSignUps).set({ usedAt: new Date() }).where(eq(pendingSignUps.id, pending.id))
      throw linkNotValid()
    }
    throw error
  }
  if (userId === undefined) throw linkNotValid()
  const user = await userById(userId)
  await startSession(event, user)
  return user
}
