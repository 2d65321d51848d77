import type { H3Event } from 'h3'
import { randomBytes } from 'node:crypto'
import { and, eq, gt, isNotNull, isNull, lte, or, sql } from 'drizzle-orm'
import type { Role, SessionUser } from '#shared/schemas/account'
import { MEMBER_ROLES as MEMBER_ROLE_LIST } from '#shared/schemas/classes'
import type { Bank, Class, User } from '../db/schema'

/** Roles that keep banks of their own (admins look after people, not banks). */
export const BANK_ROLES = ['student', 'instructor', 'practitioner'] as const satisfies readonly Role[]

/** Roles that can belong to a class and take its fault hunts. */
export const MEMBER_ROLES = MEMBER_ROLE_LIST

export function sessionUserOf(user: Pick<User, 'id' | 'role' | 'name'>): SessionUser {
  return { id: user.id, role: user.role, name: user.name }
}

/** A session id: 32 random bytes, base64url (43 characters, the `sessions.id` column). */
function newSessionId(): string {
  return randomBytes(32).toString('base64url')
}

/**
 * Starts a fresh session for `user` (replacing whatever the cookie held): a `sessions` row,
 * whose id only the sealed cookie's server-only part carries. The row decides whether the
 * cookie is still good (sign-out and "sign out everywhere" revoke it).
 */
export async function startSession(event: H3Event, user: User) {
  const db = useDB()
  const id = newSessionId()
  const maxAgeSeconds = Number(useRuntimeConfig(event).session.maxAge ?? 7 * 24 * 3600)
  // this user's ended sessions are of no further use: cleared here rather than by a job
  await db.delete(tables.sessions).where(and(
    eq(tables.sessions.userId, user.id),
    or(isNotNull(tables.sessions.revokedAt), lte(tables.sessions.expiresAt, sql`NOW(3)`)),
  ))
  await db.insert(tables.sessions).values({ id, userId: user.id, expiresAt: new Date(Date.now() + maxAgeSeconds * 1000) })
  await replaceUserSession(event, {
    user: sessionUserOf(user),
    secure: { sessionId: id, sessionVersion: user.sessionVersion },
    loggedInAt: new Date().toISOString(),
  })
}

/** Revokes one session (sign-out); a cookie holding its id is refused from then on, on every instance. */
export async function revokeSession(sessionId: string | undefined) {
  if (!sessionId) return
  await useDB().update(tables.sessions).set({ revokedAt: sql`NOW(3)` })
    .where(and(eq(tables.sessions.id, sessionId), isNull(tables.sessions.revokedAt)))
}

type Executor = Pick<ReturnType<typeof useDB>, 'update'>

/**
 * Ends every session of `userId` (password change or reset, role change, deactivation, "sign
 * out everywhere"): the rows are revoked and `sessionVersion` moves on, in `db` (a transaction
 * of the caller's, if it has one).
 */
export async function revokeAllSessions(userId: number, db: Executor = useDB()) {
  await db.update(tables.sessions).set({ revokedAt: sql`NOW(3)` })
    .where(and(eq(tables.sessions.userId, userId), isNull(tables.sessions.revokedAt)))
  await db.update(tables.users).set({ sessionVersion: sql`${tables.users.sessionVersion} + 1` })
    .where(eq(tables.users.id, userId))
}

/** Ends this browser's session: its row is revoked (by the `clear` hook, server/plugins/session-check.ts) and the cookie cleared. */
export async function endSession(event: H3Event) {
  await clearUserSession(event)
}

function signedOut(message = 'Sign in to continue') {
  return createError({ statusCode: 401, statusMessage: message })
}

/**
 * The signed-in user, re-read from the database together with the session's row in one
 * query: an active user, the session version the cookie was made with, and a session neither
 * revoked nor expired. Null when signed out (a session that fails any of these is cleared first).
 */
export async function currentUser(event: H3Event): Promise<User | null> {
  const session = await getUserSession(event)
  if (!session.user) return null
  const sessionId = session.secure?.sessionId
  const [row] = sessionId
    ? await useDB().select({ user: tables.users }).from(tables.sessions)
        .innerJoin(tables.users, eq(tables.users.id, tables.sessions.userId))
        .where(and(
          eq(tables.sessions.id, sessionId),
          eq(tables.sessions.userId, session.user.id),
          isNull(tables.sessions.revokedAt),
          gt(tables.sessions.expiresAt, sql`NOW(3)`),
          eq(tables.users.active, true),
          eq(tables.users.sessionVersion, session.secure?.sessionVersion ?? -1),
          eq(tables.users.role, session.user.role),
        ))
    : []
  const user = row?.user
  if (!user) {
    await clearUserSession(event)
    return null
  }
  if (user.name !== session.user.name) {
    await setUserSession(event, { user: sessionUserOf(user) })
  }
  return user
}

/** The signed-in user from the database if their role is one of `roles` (any role when none given): 401 signed out, 403 other role. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const user = await currentUser(event)
  if (!user) throw signedOut()
  if (roles.length > 0 && !roles.includes(user.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Your role may not do this' })
  }
  return user
}

/** The bank `bankId` if `owner` owns it (and it is not deleted, unless `deleted`), else 404: ids reveal nothing. */
export async function requireBankOwner(owner: User, bankId: number, { deleted = false } = {}): Promise<Bank> {
  const [bank] = await useDB().select().from(tables.banks).where(and(
    eq(tables.banks.id, bankId),
    eq(tables.banks.ownerId, owner.id),
    deleted ? undefined : isNull(tables.banks.deletedAt),
  ))
  if (!bank) throw bankNotFound()
  return bank
}

export function bankNotFound() {
  return createError({ statusCode: 404, statusMessage: 'No such bank' })
}

export function classNotFound() {
  return createError({ statusCode: 404, statusMessage: 'No such class' })
}

/** The class `classId` if `instructor` teaches it, else 404. */
export async function requireClassInstructor(instructor: User, classId: number): Promise<Class> {
  const [row] = await useDB().select().from(tables.classes).where(and(eq(tables.classes.id, classId), eq(tables.classes.instructorId, instructor.id)))
  if (!row) throw classNotFound()
  return row
}
