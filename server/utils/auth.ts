import type { H3Event } from 'h3'
import { and, eq, isNull } from 'drizzle-orm'
import type { Role, SessionUser } from '#shared/schemas/account'
import type { Bank, Class, User } from '../db/schema'

/** Roles that keep banks of their own (admins look after people, not banks). */
export const BANK_ROLES = ['student', 'instructor', 'practitioner'] as const satisfies readonly Role[]

/** Roles that can belong to a class and take its fault hunts. */
export const MEMBER_ROLES = ['student', 'instructor'] as const satisfies readonly Role[]

export function sessionUserOf(user: Pick<User, 'id' | 'role' | 'name'>): SessionUser {
  return { id: user.id, role: user.role, name: user.name }
}

/** Starts a fresh session for `user` (replacing whatever the cookie held). */
export async function startSession(event: H3Event, user: User) {
  await replaceUserSession(event, {
    user: sessionUserOf(user),
    secure: { sessionVersion: user.sessionVersion },
    loggedInAt: new Date().toISOString(),
  })
}

function signedOut(message = 'Sign in to continue') {
  return createError({ statusCode: 401, statusMessage: message })
}

/** The signed-in user, re-read from the database; null when signed out (an inactive, re-versioned or re-roled user's session is cleared first). */
export async function currentUser(event: H3Event): Promise<User | null> {
  const session = await getUserSession(event)
  if (!session.user) return null
  const [user] = await useDB().select().from(tables.users).where(eq(tables.users.id, session.user.id))
  if (!user || !user.active || user.sessionVersion !== session.secure?.sessionVersion || user.role !== session.user.role) {
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
