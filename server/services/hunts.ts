/**
 * Fault hunts: authoring and publishing (the instructor), and what a student may see of one.
 * The hidden faults leave this module only in `authorView`, for the hunt's own author.
 */
import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm'
import type { z } from 'zod'
import { parseCircuit } from '#shared/circuit/parse'
import type { Circuit } from '#shared/circuit/schema'
import { faultErrors, type Fault } from '#shared/hunts/faults'
import type { HuntCreateSchema, HuntPatchSchema } from '#shared/schemas/hunts'
import type { Hunt, User } from '../db/schema'
import { huntPublishedMail } from './mail-messages'

const { hunts, huntClasses, classes, classMembers, attempts, users } = tables

export function huntNotFound() {
  return createError({ statusCode: 404, statusMessage: 'No such fault hunt' })
}

/** The hunt `id` if `author` wrote it (and it is not deleted), else 404. */
export async function requireHuntAuthor(author: User, id: number): Promise<Hunt> {
  const [hunt] = await useDB().select().from(hunts).where(and(eq(hunts.id, id), eq(hunts.authorId, author.id), isNull(hunts.deletedAt)))
  if (!hunt) throw huntNotFound()
  return hunt
}

/** The hunt `id` if it is published to a class `user` belongs to, else 404. */
export async function requireHuntForMember(user: User, id: number): Promise<Hunt> {
  const [row] = await useDB().select({ hunt: hunts }).from(hunts)
    .innerJoin(huntClasses, eq(huntClasses.huntId, hunts.id))
    .innerJoin(classMembers, and(eq(classMembers.classId, huntClasses.classId), eq(classMembers.userId, user.id)))
    .where(and(eq(hunts.id, id), isNull(hunts.deletedAt)))
    .limit(1)
  if (!row) throw huntNotFound()
  return row.hunt
}

/** The bank as the engine reads it (defaults filled in); a stored hunt always parses. */
export function huntCircuit(hunt: Pick<Hunt, 'document'>): Circuit {
  const parsed = parseCircuit(hunt.document)
  if (!parsed.ok) throw createError({ statusCode: 500, statusMessage: 'A stored hunt does not parse' })
  return parsed.circuit
}

function checkFaults(document: Record<string, unknown>, faults: Fault[]) {
  const errors = faultErrors(huntCircuit({ document }), faults)
  if (errors.length) throw invalidInput(errors, 'The faults do not fit the bank')
}

export async function createHunt(author: User, body: z.output<typeof HuntCreateSchema>) {
  const bank = await requireBankOwner(author, body.bankId)
  checkFaults(bank.document, body.faults)
  const [row] = await useDB().insert(hunts).values({
    authorId: author.id,
    title: body.title,
    instructions: body.instructions,
    document: bank.document,
    faults: body.faults,
    secondaryPrewired: body.secondaryPrewired,
    dueAt: body.dueAt ? new Date(body.dueAt) : null,
    probeBudget: body.probeBudget,
    feedback: body.feedback,
  }).$returningId()
  return authorView(await requireHuntAuthor(author, row!.id))
}

async function publishedTo(huntId: number) {
  return useDB().select({ id: classes.id, name: classes.name, publishedAt: huntClasses.publishedAt })
    .from(huntClasses).innerJoin(classes, eq(classes.id, huntClasses.classId))
    .where(eq(huntClasses.huntId, huntId)).orderBy(classes.name)
}

/** Everything about a hunt, faults included: for its author only. */
export async function authorView(hunt: Hunt) {
  const [started] = await useDB().select({ n: sql<number>`count(*)` }).from(attempts).where(eq(attempts.huntId, hunt.id))
  return {
    id: hunt.id,
    as: 'author' as const,
    title: hunt.title,
    instructions: hunt.instructions,
    document: hunt.document,
    faults: hunt.faults,
    secondaryPrewired: hunt.secondaryPrewired,
    dueAt: hunt.dueAt?.toISOString() ?? null,
    probeBudget: hunt.probeBudget,
    feedback: hunt.feedback,
    publishedAt: hunt.publishedAt?.toISOString() ?? null,
    classes: (await publishedTo(hunt.id)).map(c => ({ id: c.id, name: c.name, publishedAt: c.publishedAt.toISOString() })),
    attempts: Number(started?.n ?? 0),
    createdAt: hunt.createdAt.toISOString(),
    updatedAt: hunt.updatedAt.toISOString(),
  }
}

/** What a student may know of a hunt: never the faults, never the bank (that comes with the attempt). */
export function studentView(hunt: Hunt, author: string, attempt: { id: number, status: string } | null) {
  return {
    id: hunt.id,
    as: 'student' as const,
    title: hunt.title,
    instructions: hunt.instructions,
    author,
    secondaryPrewired: hunt.secondaryPrewired,
    dueAt: hunt.dueAt?.toISOString() ?? null,
    probeBudget: hunt.probeBudget,
    feedback: hunt.feedback,
    attempt,
  }
}

async function authorName(hunt: Hunt): Promise<string> {
  const [row] = await useDB().select({ name: users.name }).from(users).where(eq(users.id, hunt.authorId))
  return row?.name ?? ''
}

/** GET /api/hunts/[id]: the author's view, or a member's (404 to anyone else). */
export async function huntFor(user: User, id: number) {
  const [own] = await useDB().select().from(hunts).where(and(eq(hunts.id, id), eq(hunts.authorId, user.id), isNull(hunts.deletedAt)))
  if (own) return authorView(own)
  const hunt = await requireHuntForMember(user, id)
  const [attempt] = await useDB().select({ id: attempts.id, status: attempts.status }).from(attempts)
    .where(and(eq(attempts.huntId, hunt.id), eq(attempts.studentId, user.id)))
  return studentView(hunt, await authorName(hunt), attempt ?? null)
}

/** The caller's own hunts (as author) and the hunts published to their classes. */
export async function listHunts(user: User) {
  const db = useDB()
  const authored = user.role === 'instructor'
    ? await db.select({
        id: hunts.id, title: hunts.title, dueAt: hunts.dueAt, publishedAt: hunts.publishedAt, updatedAt: hunts.updatedAt,
        attempts: sql<number>`(select count(*) from ${attempts} where ${attempts.huntId} = ${hunts.id})`,
        submitted: sql<number>`(select count(*) from ${attempts} where ${attempts.huntId} = ${hunts.id} and ${attempts.status} = 'submitted')`,
      }).from(hunts).where(and(eq(hunts.authorId, user.id), isNull(hunts.deletedAt))).orderBy(desc(hunts.updatedAt), desc(hunts.id))
    : []
  const assigned = await db.selectDistinct({
    id: hunts.id, title: hunts.title, dueAt: hunts.dueAt, author: users.name,
    attemptId: attempts.id, status: attempts.status,
  }).from(hunts)
    .innerJoin(huntClasses, eq(huntClasses.huntId, hunts.id))
    .innerJoin(classMembers, and(eq(classMembers.classId, huntClasses.classId), eq(classMembers.userId, user.id)))
    .innerJoin(users, eq(users.id, hunts.authorId))
    .leftJoin(attempts, and(eq(attempts.huntId, hunts.id), eq(attempts.studentId, user.id)))
    .where(isNull(hunts.deletedAt))
    .orderBy(desc(hunts.id))
  return {
    authored: authored.map(h => ({ id: h.id, title: h.title, dueAt: h.dueAt?.toISOString() ?? null, publishedAt: h.publishedAt?.toISOString() ?? null, updatedAt: h.updatedAt.toISOString(), attempts: Number(h.attempts), submitted: Number(h.submitted) })),
    assigned: assigned.map(h => ({ id: h.id, title: h.title, dueAt: h.dueAt?.toISOString() ?? null, author: h.author, attemptId: h.attemptId ?? null, status: h.status ?? 'not-started' })),
  }
}

export async function updateHunt(author: User, id: number, change: z.output<typeof HuntPatchSchema>) {
  const hunt = await requireHuntAuthor(author, id)
  const feedback = change.feedback ?? hunt.feedback
  const dueAt = change.dueAt !== undefined ? change.dueAt : hunt.dueAt?.toISOString() ?? null
  if (feedback === 'after-due' && !dueAt) throw invalidInput([{ path: 'dueAt', message: 'feedback after the due date needs a due date' }])
  if (change.faults) {
    checkFaults(hunt.document, change.faults)
    const [started] = await useDB().select({ n: sql<number>`count(*)` }).from(attempts).where(eq(attempts.huntId, id))
    if (Number(started?.n ?? 0) > 0) throw createError({ statusCode: 409, statusMessage: 'Students have started this hunt: its faults can no longer change (duplicate it instead)' })
  }
  const set: Partial<typeof hunts.$inferInsert> = { version: sql`${hunts.version} + 1` as unknown as number }
  if (change.title !== undefined) set.title = change.title
  if (change.instructions !== undefined) set.instructions = change.instructions
  if (change.secondaryPrewired !== undefined) set.secondaryPrewired = change.secondaryPrewired
  if (change.dueAt !== undefined) set.dueAt = change.dueAt ? new Date(change.dueAt) : null
  if (change.probeBudget !== undefined) set.probeBudget = change.probeBudget
  if (change.feedback !== undefined) set.feedback = change.feedback
  if (change.faults !== undefined) set.faults = change.faults
  await useDB().update(hunts).set(set).where(and(eq(hunts.id, id), eq(hunts.authorId, author.id)))
  return authorView(await requireHuntAuthor(author, id))
}

export async function deleteHunt(author: User, id: number) {
  await requireHuntAuthor(author, id)
  await useDB().update(hunts).set({ deletedAt: new Date() }).where(and(eq(hunts.id, id), eq(hunts.authorId, author.id)))
}

/** Publishes to the author's classes and mails every member of each class newly reached. */
export async function publishHunt(author: User, id: number, classIds: number[]) {
  const hunt = await requireHuntAuthor(author, id)
  const wanted = [...new Set(classIds)]
  const owned = []
  for (const classId of wanted) owned.push(await requireClassInstructor(author, classId))
  const db = useDB()
  const already = new Set((await db.select({ classId: huntClasses.classId }).from(huntClasses).where(eq(huntClasses.huntId, id))).map(r => r.classId))
  const fresh = owned.filter(c => !already.has(c.id))
  if (fresh.length) {
    await db.insert(huntClasses).values(fresh.map(c => ({ huntId: id, classId: c.id }))).onDuplicateKeyUpdate({ set: { classId: sql`class_id` } })
  }
  if (!hunt.publishedAt) await db.update(hunts).set({ publishedAt: new Date() }).where(eq(hunts.id, id))
  let mailed = 0
  let unsent = 0
  if (fresh.length) {
    const members = await db.select({ classId: classMembers.classId, name: users.name, email: users.email })
      .from(classMembers).innerJoin(users, eq(users.id, classMembers.userId))
      .where(and(inArray(classMembers.classId, fresh.map(c => c.id)), eq(users.active, true)))
    const link = publicUrl(`/hunts/${id}`)
    for (const m of members) {
      const klass = fresh.find(c => c.id === m.classId)!
      try {
        await queueMail(huntPublishedMail(m.email, m.name, author.name, hunt.title, klass.name, hunt.dueAt, link))
        mailed++
      }
      catch (error) {
        // the hunt is published either way: the students find it on their hunts page
        console.error('hunt notice not queued:', (error as Error).message)
        unsent++
      }
    }
  }
  return { ...(await authorView(await requireHuntAuthor(author, id))), mailed, unsent }
}
