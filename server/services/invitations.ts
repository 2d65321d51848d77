/** Accepting an instructor invitation: a new instructor account, or an upgrade of the invitee's own. */
import type { H3Event } from 'h3'
import { and, eq, gt, isNull } from 'drizzle-orm'
import type { Invitation, User } from '../db/schema'
import { createAccount, userByEmail, userById } from './accounts'

const { invitations, users } = tables

function invitationGone() {
  return createError({ statusCode: 404, statusMessage: 'This invitation has expired, was used, or never existed' })
}

/** The open invitation behind a link's token, or 404. */
export async function openInvitation(token: string): Promise<Invitation> {
  const [invitation] = await useDB().select().from(invitations).where(and(
    eq(invitations.tokenHash, hashLinkToken(token)),
    isNull(invitations.acceptedAt),
    gt(invitations.expiresAt, new Date()),
  ))
  if (!invitation) throw invitationGone()
  return invitation
}

export async function acceptInvitation(event: H3Event, token: string, signedIn: User | null, body: { name?: string, password?: string }) {
  const invitation = await openInvitation(token)
  const existing = await userByEmail(invitation.email)
  if (existing && signedIn?.id !== existing.id) {
    throw createError({ statusCode: 409, statusMessage: 'Sign in first', data: { errors: [{ path: 'email', message: `an account with ${invitation.email} exists: sign in to it, then open the invitation link again` }] } })
  }
  if (existing?.role === 'admin') {
    throw createError({ statusCode: 409, statusMessage: 'Already an admin', data: { errors: [{ path: 'email', message: 'this account is an admin account; an admin can change roles on the users page' }] } })
  }
  if (!existing) {
    const missing = [
      !body.name ? { path: 'name', message: 'enter your name' } : null,
      !body.password ? { path: 'password', message: 'choose a password' } : null,
    ].filter(e => e !== null)
    if (missing.length) throw invalidInput(missing, 'Invalid body')
  }
  const claimed = await claim(invitation)
  if (!claimed) throw invitationGone()
  let user: User
  let created = false
  if (existing) {
    await useDB().transaction(async (tx) => {
      await tx.update(users).set({ role: 'instructor' }).where(eq(users.id, existing.id))
      await revokeAllSessions(existing.id, tx)
    })
    user = await userById(existing.id)
  }
  else {
    user = await createAccount({ name: body.name!, email: invitation.email, password: body.password!, role: 'instructor' })
    created = true
  }
  await startSession(event, user)
  return { user, created }
}

async function claim(invitation: Invitation): Promise<boolean> {
  const [result] = await useDB().update(invitations).set({ acceptedAt: new Date() })
    .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt)))
  return result.affectedRows === 1
}
