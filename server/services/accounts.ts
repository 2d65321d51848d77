/** Sign-in, password reset, account changes and the users they read (sign-up is in sign-up.ts). */
import type { H3Event } from 'h3'
import { and, eq, gt, isNull } from 'drizzle-orm'
import type { SignInBody } from '#shared/schemas/account'
import type { User } from '../db/schema'
import { passwordResetMail } from './mail-messages'

const RESET_LINK_HOURS = 1
const WRONG_CREDENTIALS = 'Wrong e-mail or password'

export function userNotice(user: User) {
  return { user: sessionUserOf(user) }
}

function isDuplicateEntry(error: unknown): boolean {
  const e = error as { code?: string, cause?: { code?: string } }
  return e?.code === 'ER_DUP_ENTRY' || e?.cause?.code === 'ER_DUP_ENTRY'
}

export function emailTaken() {
  return createError({ statusCode: 409, statusMessage: 'E-mail already registered', data: { errors: [{ path: 'email', message: 'an account with this e-mail already exists: sign in, or reset the password' }] } })
}

export async function userById(id: number): Promise<User> {
  const [user] = await useDB().select().from(tables.users).where(eq(tables.users.id, id))
  if (!user) throw createError({ statusCode: 404, statusMessage: 'No such user' })
  return user
}

export async function userByEmail(email: string): Promise<User | undefined> {
  const [user] = await useDB().select().from(tables.users).where(eq(tables.users.email, email))
  return user
}

/** Creates an account (an accepted invitation); 409 when the e-mail is taken. */
export async function createAccount(input: { name: string, email: string, password: string, role: User['role'] }): Promise<User> {
  const passwordHash = await hashPassword(input.password)
  try {
    const [row] = await useDB().insert(tables.users)
      .values({ name: input.name, email: input.email, role: input.role, passwordHash })
      .$returningId()
    return userById(row!.id)
  }
  catch (error) {
    if (isDuplicateEntry(error)) throw emailTaken()
    throw error
  }
}

let decoyHash: Promise<string> | undefined

/**
 * Checks e-mail and password. The same 401 for an unknown e-mail and a wrong password (and a
 * password check either way, so the time taken tells nothing either). The sign-in limit
 * (server/utils/sign-in-limit.ts) takes its point before the password is checked: 429 with
 * Retry-After once this e-mail has failed `signInLimit.attempts` times from this IP within the
 * window, or this IP has failed too often today.
 */
export async function signIn(event: H3Event, body: SignInBody): Promise<User> {
  const attempt = await beginPasswordAttempt(event, body.email)
  const user = await userByEmail(body.email)
  decoyHash ??= hashPassword('not-a-password-anyone-has')
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !ok) {
    throw createError({ statusCode: 401, statusMessage: WRONG_CREDENTIALS, data: { errors: [{ path: 'password', message: 'wrong e-mail or password' }] } })
  }
  await attempt.succeeded()
  if (!user.active) {
    throw createError({ statusCode: 403, statusMessage: 'This account has been deactivated: ask an administrator' })
  }
  await startSession(event, user)
  return user
}

/**
 * Queues a reset link when the e-mail belongs to an active account; says nothing either way.
 * The message goes out from the mail queue, never inside this request, so the answer takes
 * the same time for an address with an account and one without.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const user = await userByEmail(email)
  if (!user || !user.active) return
  const token = newLinkToken()
  // the link and its message commit together: one write, and no link without its mail
  await useDB().transaction(async (tx) => {
    await tx.insert(tables.passwordResets).values({
      userId: user.id,
      tokenHash: hashLinkToken(token),
      expiresAt: new Date(Date.now() + RESET_LINK_HOURS * 3600_000),
    })
    await queueMail(passwordResetMail(user.email, user.name, publicUrl(`/reset?token=${token}`)), tx)
  })
}

function linkUsedOrExpired() {
  return invalidInput([{ path: 'token', message: 'this reset link has expired or was already used: ask for a new one' }], 'Reset link not valid')
}

/** Sets a new password from a reset link (single use, within the hour) and signs the user out everywhere. */
export async function resetPassword(token: string, password: string): Promise<User> {
  const db = useDB()
  const [reset] = await db.select().from(tables.passwordResets).where(and(
    eq(tables.passwordResets.tokenHash, hashLinkToken(token)),
    isNull(tables.passwordResets.usedAt),
    gt(tables.passwordResets.expiresAt, new Date()),
  ))
  if (!reset) throw linkUsedOrExpired()
  const passwordHash = await hashPassword(password)
  const used = await db.transaction(async (tx) => {
    // claiming the link in its own WHERE makes a second, concurrent use fail
    const [claim] = await tx.update(tables.passwordResets)
      .set({ usedAt: new Date() })
      .where(and(eq(tables.passwordResets.id, reset.id), isNull(tables.passwordResets.usedAt)))
    if (claim.affectedRows !== 1) return false
    await tx.update(tables.users).set({ passwordHash }).where(eq(tables.users.id, reset.userId))
    await revokeAllSessions(reset.userId, tx)
    // any other outstanding link of this user dies with this one
    await tx.update(tables.passwordResets)
      .set({ usedAt: new Date() })
      .where(and(eq(tables.passwordResets.userId, reset.userId), isNull(tables.passwordResets.usedAt)))
    return true
  })
  if (!used) throw linkUsedOrExpired()
  return userById(reset.userId)
}

/**
 * Changes the signed-in user's name and/or password (with the current one, checked under the
 * same limit as a sign-in); a new password ends every session and starts a fresh one here.
 */
export async function updateAccount(event: H3Event, user: User, body: { name?: string, currentPassword?: string, newPassword?: string }): Promise<User> {
  const changes: Record<string, unknown> = {}
  if (body.name !== undefined) changes.name = body.name
  if (body.newPassword !== undefined) {
    const attempt = await beginPasswordAttempt(event, user.email, 'currentPassword')
    if (!(await verifyPassword(user.passwordHash, body.currentPassword ?? ''))) {
      throw invalidInput([{ path: 'currentPassword', message: 'that is not your current password' }], 'Wrong current password')
    }
    await attempt.succeeded()
    changes.passwordHash = await hashPassword(body.newPassword)
  }
  await useDB().transaction(async (tx) => {
    await tx.update(tables.users).set(changes).where(eq(tables.users.id, user.id))
    if (body.newPassword !== undefined) await revokeAllSessions(user.id, tx)
  })
  const updated = await userById(user.id)
  if (body.newPassword !== undefined) await startSession(event, updated)
  else await setUserSession(event, { user: sessionUserOf(updated) })
  return updated
}
