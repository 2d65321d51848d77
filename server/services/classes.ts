/** Classes: an instructor's roster, invitations by e-mail, join codes. Every query names the instructor or the member. */
import { randomInt } from 'node:crypto'
import { and, asc, count, desc, eq, gt, inArray, isNull, max, or, sql } from 'drizzle-orm'
import type { z } from 'zod'
import type { ClassCreateSchema, ClassPatchSchema, ClassSummary, RosterRow } from '#shared/schemas/classes'
import type { Class, User } from '../db/schema'
import { classInvitationMail } from './mail-messages'

const { classes, classMembers, classInvitations, users, attempts, hunts, huntClasses } = tables

/** A class invitation link is good for this long. */
export const CLASS_INVITATION_DAYS = 14
/** Letters and digits that cannot be misread for each other (no I, O, 0, 1). */
const CODE_ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZ23456789'

/** A MAX() over a datetime comes back as a Date or as MariaDB's text (UTC, pool timezone 'Z'). */
export function dateOrNull(value: unknown): string | null {
  if (value === null || value === undefined) return null
  if (value instanceof Date) return value.toISOString()
  const text = String(value)
  return new Date(/[zZ]|[+-]\d\d:?\d\d$/.test(text) ? text : `${text.replace(' ', 'T')}Z`).toISOString()
}

function newJoinCode(): string {
  let code = ''
  for (let i = 0; i < 8; i++) code += CODE_ALPHABET[randomInt(CODE_ALPHABET.length)]
  return code
}

/** The class `id` if `user` teaches it or belongs to it, with which; else 404. */
export async function requireClassAccess(user: User, id: number): Promise<{ klass: Class, as: 'instructor' | 'member' }> {
  const [row] = await useDB().select({ klass: classes, member: classMembers.userId }).from(classes)
    .leftJoin(classMembers, and(eq(classMembers.classId, classes.id), eq(classMembers.userId, user.id)))
    .where(and(eq(classes.id, id), or(eq(classes.instructorId, user.id), eq(classMembers.userId, user.id))))
  if (!row) throw classNotFound()
  return { klass: row.klass, as: row.klass.instructorId === user.id ? 'instructor' : 'member' }
}

export async function listClasses(user: User): Promise<ClassSummary[]> {
  const db = useDB()
  const memberCount = db.select({ classId: classMembers.classId, n: count().as('n') }).from(classMembers).groupBy(classMembers.classId).as('member_count')
  const rows = await db.select({
    klass: classes,
    instructor: users.name,
    members: memberCount.n,
    mine: classMembers.userId,
  }).from(classes)
    .innerJoin(users, eq(users.id, classes.instructorId))
    .leftJoin(memberCount, eq(memberCount.classId, classes.id))
    .leftJoin(classMembers, and(eq(classMembers.classId, classes.id), eq(classMembers.userId, user.id)))
    .where(or(eq(classes.instructorId, user.id), eq(classMembers.userId, user.id)))
    .orderBy(desc(classes.createdAt), desc(classes.id))
  return rows.map(r => ({
    id: r.klass.id,
    name: r.klass.name,
    term: r.klass.term,
    tolerancePercent: Number(r.klass.tolerancePercent),
    as: r.klass.instructorId === user.id ? 'instructor' : 'member',
    instructor: r.instructor,
    members: Number(r.members ?? 0),
  }))
}

export async function createClass(instructor: User, body: z.output<typeof ClassCreateSchema>) {
  for (let tries = 0; ; tries++) {
    try {
      const [row] = await useDB().insert(classes).values({ instructorId: instructor.id, name: body.name, term: body.term, tolerancePercent: body.tolerancePercent, joinCode: newJoinCode() }).$returningId()
      return classDetail(instructor, row!.id)
    }
    catch (error) {
      // a join code already taken (32^8 codes: rare); try another
      if (tries < 3 && (error as { cause?: { code?: string } }).cause?.code === 'ER_DUP_ENTRY') continue
      throw error
    }
  }
}

/** What the caller may see of a class: the instructor gets the roster and the join code. */
export async function classDetail(user: User, id: number) {
  const { klass, as } = await requireClassAccess(user, id)
  const db = useDB()
  const [instructor] = await db.select({ name: users.name }).from(users).where(eq(users.id, klass.instructorId))
  const published = await db.select({ id: hunts.id, title: hunts.title, dueAt: hunts.dueAt })
    .from(huntClasses).innerJoin(hunts, eq(hunts.id, huntClasses.huntId))
    .where(and(eq(huntClasses.classId, klass.id), isNull(hunts.deletedAt)))
    .orderBy(desc(huntClasses.publishedAt))
  const base = {
    id: klass.id,
    name: klass.name,
    term: klass.term,
    tolerancePercent: Number(klass.tolerancePercent),
    as,
    instructor: instructor?.name ?? '',
    hunts: published.map(h => ({ id: h.id, title: h.title, dueAt: h.dueAt?.toISOString() ?? null })),
  }
  if (as !== 'instructor') return base
  return { ...base, joinCode: klass.joinCode, roster: await roster(klass), invitations: await openInvitations(klass) }
}

async function roster(klass: Class): Promise<RosterRow[]> {
  const db = useDB()
  const classHunts = db.select({ huntId: huntClasses.huntId }).from(huntClasses).where(eq(huntClasses.classId, klass.id))
  const activity = db.select({
    studentId: attempts.studentId,
    n: count().as('n'),
    last: max(attempts.lastActivityAt).as('last'),
  }).from(attempts).where(inArray(attempts.huntId, classHunts)).groupBy(attempts.studentId).as('activity')
  const rows = await db.select({ userId: users.id, name: users.name, email: users.email, joinedAt: classMembers.joinedAt, n: activity.n, last: activity.last })
    .from(classMembers)
    .innerJoin(users, eq(users.id, classMembers.userId))
    .leftJoin(activity, eq(activity.studentId, classMembers.userId))
    .where(eq(classMembers.classId, klass.id))
    .orderBy(asc(users.name), asc(users.id))
  return rows.map(r => ({
    userId: r.userId,
    name: r.name,
    email: r.email,
    joinedAt: r.joinedAt.toISOString(),
    attempts: Number(r.n ?? 0),
    lastActivityAt: dateOrNull(r.last),
  }))
}

async function openInvitations(klass: Class) {
  const rows = await useDB().select({ id: classInvitations.id, email: classInvitations.email, expiresAt: classInvitations.expiresAt, createdAt: classInvitations.createdAt })
    .from(classInvitations)
    .where(and(eq(classInvitations.classId, klass.id), isNull(classInvitations.usedAt), gt(classInvitations.expiresAt, new Date())))
    .orderBy(desc(classInvitations.createdAt))
  return rows.map(r => ({ id: r.id, email: r.email, expiresAt: r.expiresAt.toISOString(), sentAt: r.createdAt.toISOString() }))
}

export async function updateClass(instructor: User, id: number, change: z.output<typeof ClassPatchSchema>) {
  await requireClassInstructor(instructor, id)
  await useDB().update(classes).set(change).where(and(eq(classes.id, id), eq(classes.instructorId, instructor.id)))
  return classDetail(instructor, id)
}

export async function deleteClass(instructor: User, id: number) {
  await requireClassInstructor(instructor, id)
  // members, invitations and publications go with it (foreign keys cascade); attempts stay with their hunts
  await useDB().delete(classes).where(and(eq(classes.id, id), eq(classes.instructorId, instructor.id)))
}

/** Mails each address a single-use link to join; returns what was sent. */
export async function inviteToClass(instructor: User, id: number, emails: string[]) {
  const klass = await requireClassInstructor(instructor, id)
  const unique = [...new Set(emails)]
  const expiresAt = new Date(Date.now() + CLASS_INVITATION_DAYS * 86400_000)
  const sent: { email: string, expiresAt: string }[] = []
  for (const email of unique) {
    const token = newLinkToken()
    await useDB().transaction(async (tx) => {
      await tx.insert(classInvitations).values({ classId: klass.id, email, tokenHash: hashLinkToken(token), expiresAt })
      await queueMail(classInvitationMail(email, instructor.name, klass.name, publicUrl(`/classes/join?token=${token}`), CLASS_INVITATION_DAYS), tx)
    })
    sent.push({ email, expiresAt: expiresAt.toISOString() })
  }
  return { sent }
}

function joinRefused() {
  return createError({ statusCode: 404, statusMessage: 'No class found: the code or link is wrong, expired or already used' })
}

/** The invitation a link's token names, if it is neither used nor expired. */
function usableInvitation(token: string) {
  return and(
    eq(classInvitations.tokenHash, hashLinkToken(token)),
    isNull(classInvitations.usedAt),
    gt(classInvitations.expiresAt, new Date()),
  )
}

/**
 * The class an unused, unexpired invitation token is for, so that its landing page can name
 * it before the student joins. Whoever holds the token may join with it, so the class's name
 * and its instructor's tell them nothing more; a token that is wrong, used or expired gets the
 * same answer as joining with it would.
 */
export async function previewInvitation(user: User, token: string) {
  const db = useDB()
  const [row] = await db.select({ classId: classes.id, className: classes.name, term: classes.term, instructorId: classes.instructorId, instructorName: users.name, expiresAt: classInvitations.expiresAt })
    .from(classInvitations)
    .innerJoin(classes, eq(classes.id, classInvitations.classId))
    .innerJoin(users, eq(users.id, classes.instructorId))
    .where(usableInvitation(token))
  if (!row) throw joinRefused()
  return { className: row.className, term: row.term, instructorName: row.instructorName, expiresAt: row.expiresAt.toISOString(), youTeachIt: row.instructorId === user.id }
}

/** Joins by code or by an invitation's token (claimed once, atomically). */
export async function joinClass(user: User, body: { code?: string, token?: string }) {
  const db = useDB()
  let klass: Class | undefined
  if (body.code) {
    [klass] = await db.select().from(classes).where(eq(classes.joinCode, body.code))
    if (!klass) throw joinRefused()
  }
  else {
    const [invitation] = await db.select().from(classInvitations).where(usableInvitation(body.token!))
    if (!invitation) throw joinRefused()
    ;[klass] = await db.select().from(classes).where(eq(classes.id, invitation.classId))
    if (!klass) throw joinRefused()
    if (klass.instructorId === user.id) throw createError({ statusCode: 409, statusMessage: 'You teach this class' })
    const [claimed] = await db.update(classInvitations).set({ usedAt: new Date() })
      .where(and(eq(classInvitations.id, invitation.id), isNull(classInvitations.usedAt)))
    if (claimed.affectedRows !== 1) throw joinRefused()
  }
  if (klass.instructorId === user.id) throw createError({ statusCode: 409, statusMessage: 'You teach this class' })
  await db.insert(classMembers).values({ classId: klass.id, userId: user.id }).onDuplicateKeyUpdate({ set: { userId: sql`user_id` } })
  return { id: klass.id, name: klass.name }
}

export async function removeMember(instructor: User, id: number, userId: number) {
  await requireClassInstructor(instructor, id)
  const [result] = await useDB().delete(classMembers).where(and(eq(classMembers.classId, id), eq(classMembers.userId, userId)))
  if (result.affectedRows !== 1) throw createError({ statusCode: 404, statusMessage: 'That person is not in this class' })
}
