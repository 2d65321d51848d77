/** Sign-up, sign-in, password reset and account changes. */
import type { H3Event } from 'h3'
import { and, eq, gt, isNull, sql } from 'drizzle-orm'
import type { RateLimiterRes } from 'rate-limiter-flexible'
import type { SignInBody, SignUpBody } from '#shared/schemas/account'
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

/** Creates an account; 409 when the e-mail is taken. */
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

export async function signUp(event: H3Event, body: SignUpBody): Promise<User> {
  const user = await createAccount(body)
  await startSession(event, user)
  return user
}

let decoyHash: Promise<string> | undefined

/**
 * Checks e-mail and password. The same 401 for an unknown e-mail and a wrong password (and a
 * password check either way, so the time taken tells nothing either); 429 with Retry-After
 * after `signInLimit.attempts` failures for this e-mail from this IP within the window.
 */
export async function signIn(event: H3Event, body: SignInBody): Promise<User> {
  const limiter = signInLimiter()
  const key = signInLimitKey(body.email, getRequestIP(event) ?? 'unknown')
  const record = await limiter.get(key)
  if (record && record.consumedPoints >= limiter.points) throw tooManyAttempts(event, record)

  const user = await userByEmail(body.email)
  decoyHash ??= hashPassword('not-a-password-anyone-has')
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !ok) {
    await limiter.penalty(key, 1)
    throw createError({ statusCode: 401, statusMessage: WRONG_CREDENTIALS, data: { errors: [{ path: 'password', message: 'wrong e-mail or password' }] } })
  }
  await limiter.delete(key)
  if (!user.active) {
    throw createError({ statusCode: 403, statusMessage: 'This account has been deactivated: ask an administrator' })
  }
  await startSession(event, user)
  return user
}

function tooManyAttempts(event: H3Event, record: RateLimiterRes) {
  const seconds = Math.max(1, Math.ceil(record.msBeforeNext / 1000))
  setResponseHeader(event, 'Retry-After', seconds)
  return createError({
    statusCode: 429,
    statusMessage: 'Too many failed sign-ins',
    data: { retryAfterSeconds: seconds, errors: [{ path: 'password', message: `too many failed attempts: try again in ${Math.ceil(seconds / 60)} minute(s), or reset the password` }] },
  })
}

/** Mails a reset link when the e-mail belongs to an active account; says nothing either way. */
export async function requestPasswordReset(email: string): Promise<void> {
  const user = await userByEmail(email)
  if (!user || !user.active) return
  const token = newLinkToken()
  await useDB().insert(tables.passwordResets).values({
    userId: user.id,
    tokenHash: hashLinkToken(token),
    expiresAt: new Date(Date.now() + RESET_LINK_HOURS * 3600_000),
  })
  try {
    await sendMail(passwordResetMail(user.email, user.name, publicUrl(`/reset?token=${token}`)))
  }
  catch (error) {
    console.error('[mail] the password reset message was not sent:', (error as Error).message)
  }
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
    await tx.update(tables.users)
      .set({ passwordHash, sessionVersion: sql`${tables.users.sessionVersion} + 1` })
      .where(eq(tables.users.id, reset.userId))
    // any other outstanding link of this user dies with this one
    await tx.update(tables.passwordResets)
      .set({ usedAt: new Date() })
      .where(and(eq(tables.passwordResets.userId, reset.userId), isNull(tables.passwordResets.usedAt)))
    return true
  })
  if (!used) throw linkUsedOrExpired()
  return userById(reset.userId)
}

/** Changes the signed-in user's name and/or password (with the current one); a new password signs out other sessions. */
export async function updateAccount(event: H3Event, user: User, body: { name?: string, currentPassword?: string, newPassword?: string }): Promise<User> {
  const changes: Record<string, unknown> = {}
  if (body.name !== undefined) changes.name = body.name
  if (body.newPassword !== undefined) {
    if (!(await verifyPassword(user.passwordHash, body.currentPassword ?? ''))) {
      throw invalidInput([{ path: 'currentPassword', message: 'that is not your current password' }], 'Wrong current password')
    }
    changes.passwordHash = await hashPassword(body.newPassword)
    changes.sessionVersion = sql`${tables.users.sessionVersion} + 1`
  }
  await useDB().update(tables.users).set(changes).where(eq(tables.users.id, user.id))
  const updated = await userById(user.id)
  await startSession(event, updated)
  return updated
}
