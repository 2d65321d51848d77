/**
 * Lab sheets: a student's real readings against the prediction. The owner writes a sheet
 * while it is a draft (or sent back to redo); the instructor of the class it was submitted
 * to reads and reviews it. Every query names the owner or the class's instructor.
 */
import { and, desc, eq, inArray, isNotNull, isNull, ne, or, sql } from 'drizzle-orm'
import type { z } from 'zod'
import { compareSheet, DEFAULT_TOLERANCE_PERCENT } from '#shared/lab-sheets/compare'
import type { TestPoint } from '#shared/lab-sheets/points'
import type { LabSheetCreateSchema, LabSheetPatchSchema } from '#shared/schemas/lab-sheets'
import { starterBySlug } from '#shared/starters'
import type { LabSheet, User } from '../db/schema'
import { labSheetReviewedMail } from './mail-messages'

const { labSheets, labSheetPhotos, classes, classMembers, users } = tables

export function sheetNotFound() {
  return createError({ statusCode: 404, statusMessage: 'No such lab sheet' })
}

/** The sheet if `user` owns it, or teaches the class it was submitted to (not a draft); else 404. */
export async function readableSheet(user: User, id: number): Promise<{ sheet: LabSheet, as: 'owner' | 'instructor' }> {
  const [row] = await useDB().select({ sheet: labSheets }).from(labSheets)
    .leftJoin(classes, eq(classes.id, labSheets.classId))
    .where(and(eq(labSheets.id, id), or(
      eq(labSheets.ownerId, user.id),
      and(eq(classes.instructorId, user.id), ne(labSheets.status, 'draft')),
    )))
  if (!row) throw sheetNotFound()
  return { sheet: row.sheet, as: row.sheet.ownerId === user.id ? 'owner' : 'instructor' }
}

/** The caller's own sheet, still theirs to change (a draft, or sent back to redo). */
export async function writableSheet(owner: User, id: number): Promise<LabSheet> {
  const [sheet] = await useDB().select().from(labSheets).where(and(eq(labSheets.id, id), eq(labSheets.ownerId, owner.id)))
  if (!sheet) throw sheetNotFound()
  if (sheet.status !== 'draft' && sheet.status !== 'redo') {
    throw createError({ statusCode: 409, statusMessage: sheet.status === 'accepted' ? 'This sheet was accepted: it is read-only' : 'This sheet is with your instructor: it is read-only until it is reviewed' })
  }
  return sheet
}

async function requireMembership(user: User, classId: number) {
  const [row] = await useDB().select({ classId: classMembers.classId }).from(classMembers).where(and(eq(classMembers.classId, classId), eq(classMembers.userId, user.id)))
  if (!row) throw invalidInput([{ path: 'classId', message: 'you are not in that class' }])
}

async function classOf(classId: number | null) {
  if (classId === null) return null
  const [row] = await useDB().select({ id: classes.id, name: classes.name, tolerancePercent: classes.tolerancePercent, instructorId: classes.instructorId }).from(classes).where(eq(classes.id, classId))
  return row ? { id: row.id, name: row.name, tolerancePercent: Number(row.tolerancePercent), instructorId: row.instructorId } : null
}

/** The supply's nominal line volts, read straight off the stored document (checked when the sheet was made). */
function nominalSupply(document: Record<string, unknown>): number | null {
  const components = Array.isArray(document.components) ? document.components as { kind?: unknown, lineVolts?: unknown }[] : []
  const supply = components.find(c => c?.kind === 'supply')
  return typeof supply?.lineVolts === 'number' ? supply.lineVolts : null
}

/** The bank's test points with their predictions, solved in the engine's pool. */
function predictPoints(document: Record<string, unknown>): Promise<TestPoint[]> {
  return runEngine('labPoints', document)
}

/**
 * The sheet's stored test points. A sheet made before they were stored has none yet: they are
 * worked out once, here, and stored, so no later read or list solves anything.
 */
async function storedPoints(sheet: Pick<LabSheet, 'id' | 'document' | 'points'>): Promise<TestPoint[]> {
  if (sheet.points) return sheet.points as TestPoint[]
  const points = await predictPoints(sheet.document)
  await useDB().update(labSheets).set({ points, pointCount: points.length }).where(and(eq(labSheets.id, sheet.id), isNull(labSheets.points)))
  return points
}

export function photoUrl(sheetId: number, photoId: number, thumb = false) {
  return `/api/lab-sheets/${sheetId}/photos/${photoId}${thumb ? '?size=thumb' : ''}`
}

/** The whole sheet: test points, the comparison, photos and review. */
export async function sheetView(sheet: LabSheet, as: 'owner' | 'instructor') {
  const klass = await classOf(sheet.classId)
  const [owner] = await useDB().select({ name: users.name, email: users.email }).from(users).where(eq(users.id, sheet.ownerId))
  const points = await storedPoints(sheet)
  const tolerancePercent = klass?.tolerancePercent ?? DEFAULT_TOLERANCE_PERCENT
  const comparison = compareSheet(points, sheet.measured, {
    tolerancePercent,
    nominalSupplyVolts: nominalSupply(sheet.document),
    measuredSupplyVolts: sheet.supplyVolts,
    rescale: sheet.rescale,
  })
  const photos = await useDB().select().from(labSheetPhotos).where(eq(labSheetPhotos.sheetId, sheet.id)).orderBy(labSheetPhotos.id)
  return {
    id: sheet.id,
    as,
    title: sheet.title,
    status: sheet.status,
    owner: { name: owner?.name ?? '', email: as === 'instructor' ? owner?.email ?? '' : undefined },
    class: klass ? { id: klass.id, name: klass.name, tolerancePercent: klass.tolerancePercent } : null,
    document: sheet.document,
    nominalSupplyVolts: nominalSupply(sheet.document),
    supplyVolts: sheet.supplyVolts,
    rescale: sheet.rescale,
    notes: sheet.notes,
    measured: sheet.measured,
    comparison,
    photos: photos.map(p => ({ id: p.id, caption: p.caption, width: p.width, height: p.height, bytes: p.bytes, url: photoUrl(sheet.id, p.id), thumbUrl: photoUrl(sheet.id, p.id, true) })),
    review: sheet.reviewedAt ? { comment: sheet.reviewComment ?? '', at: sheet.reviewedAt.toISOString() } : null,
    version: sheet.version,
    submittedAt: sheet.submittedAt?.toISOString() ?? null,
    createdAt: sheet.createdAt.toISOString(),
    updatedAt: sheet.updatedAt.toISOString(),
  }
}

export async function createSheet(owner: User, body: z.output<typeof LabSheetCreateSchema>) {
  let document: Record<string, unknown>
  let title: string
  if (body.bankId !== undefined) {
    const bank = await requireBankOwner(owner, body.bankId)
    document = bank.document
    title = body.title ?? bank.name
  }
  else {
    const starter = starterBySlug(body.starter!)
    if (!starter) throw invalidInput([{ path: 'starter', message: `there is no starter "${body.starter}"` }])
    document = starter.document as unknown as Record<string, unknown>
    title = body.title ?? starter.title
  }
  const points = await predictPoints(document)
  if (points.length === 0) {
    throw invalidInput([{ path: body.bankId !== undefined ? 'bankId' : 'starter', message: 'this bank gives no readings to take: it needs a supply, units and an energizable path' }], 'No test points')
  }
  if (body.classId !== undefined) await requireMembership(owner, body.classId)
  const [row] = await useDB().insert(labSheets).values({ ownerId: owner.id, title: title.slice(0, 120), document, points, pointCount: points.length, measured: {}, notes: '', classId: body.classId ?? null }).$returningId()
  const { sheet } = await readableSheet(owner, row!.id)
  return sheetView(sheet, 'owner')
}

export async function updateSheet(owner: User, id: number, change: z.output<typeof LabSheetPatchSchema>) {
  const sheet = await writableSheet(owner, id)
  if (change.measured) {
    const known = new Set((await storedPoints(sheet)).map(p => p.id))
    const unknown = Object.keys(change.measured).filter(k => !known.has(k))
    if (unknown.length) throw invalidInput(unknown.map(k => ({ path: `measured["${k}"]`, message: 'this sheet has no such test point' })))
  }
  if (change.classId) await requireMembership(owner, change.classId)
  const set: Partial<typeof labSheets.$inferInsert> = { version: sql`${labSheets.version} + 1` as unknown as number }
  if (change.title !== undefined) set.title = change.title
  if (change.measured !== undefined) set.measured = { ...sheet.measured, ...change.measured }
  if (change.supplyVolts !== undefined) set.supplyVolts = change.supplyVolts
  if (change.rescale !== undefined) set.rescale = change.rescale
  if (change.notes !== undefined) set.notes = change.notes
  if (change.classId !== undefined) set.classId = change.classId
  const [result] = await useDB().update(labSheets).set(set)
    .where(and(eq(labSheets.id, id), eq(labSheets.ownerId, owner.id), eq(labSheets.version, change.version), inArray(labSheets.status, ['draft', 'redo'])))
  if (result.affectedRows !== 1) throw createError({ statusCode: 409, statusMessage: 'This sheet changed since you loaded it: reload it' })
  const { sheet: saved } = await readableSheet(owner, id)
  return sheetView(saved, 'owner')
}

export async function deleteSheet(owner: User, id: number) {
  const sheet = await writableSheet(owner, id)
  if (sheet.status !== 'draft') throw createError({ statusCode: 409, statusMessage: 'Only a draft can be deleted' })
  const photos = await useDB().select().from(labSheetPhotos).where(eq(labSheetPhotos.sheetId, id))
  await useDB().delete(labSheets).where(and(eq(labSheets.id, id), eq(labSheets.ownerId, owner.id)))
  const storage = useStorage('uploads')
  for (const p of photos) {
    await storage.removeItem(p.storageKey)
    await storage.removeItem(p.thumbKey)
  }
}

export async function submitSheet(owner: User, id: number, classId: number | undefined) {
  const sheet = await writableSheet(owner, id)
  const target = classId ?? sheet.classId
  if (!target) throw invalidInput([{ path: 'classId', message: 'choose the class to hand the sheet in to' }])
  await requireMembership(owner, target)
  const [result] = await useDB().update(labSheets).set({ status: 'submitted', classId: target, submittedAt: new Date(), version: sql`${labSheets.version} + 1` })
    .where(and(eq(labSheets.id, id), eq(labSheets.ownerId, owner.id), inArray(labSheets.status, ['draft', 'redo'])))
  if (result.affectedRows !== 1) throw createError({ statusCode: 409, statusMessage: 'This sheet was handed in already' })
  const { sheet: saved } = await readableSheet(owner, id)
  return sheetView(saved, 'owner')
}

export async function reviewSheet(instructor: User, id: number, verdict: 'accepted' | 'redo', comment: string) {
  const { sheet, as } = await readableSheet(instructor, id)
  if (as !== 'instructor') throw sheetNotFound()
  const [result] = await useDB().update(labSheets).set({ status: verdict, reviewComment: comment, reviewedAt: new Date(), version: sql`${labSheets.version} + 1` })
    .where(and(eq(labSheets.id, id), eq(labSheets.status, 'submitted'), isNotNull(labSheets.classId)))
  if (result.affectedRows !== 1) throw createError({ statusCode: 409, statusMessage: 'Only a handed-in sheet can be reviewed' })
  const [owner] = await useDB().select().from(users).where(eq(users.id, sheet.ownerId))
  if (owner) {
    try {
      await queueMail(labSheetReviewedMail(owner.email, owner.name, sheet.title, verdict, comment, publicUrl(`/lab-sheets/${id}`)))
    }
    catch (error) {
      console.error('review notice not queued:', (error as Error).message)
    }
  }
  const { sheet: saved } = await readableSheet(instructor, id)
  return sheetView(saved, 'instructor')
}

/** The columns a list shows: never the document or the points. */
const listColumns = {
  id: labSheets.id,
  title: labSheets.title,
  status: labSheets.status,
  classId: labSheets.classId,
  measured: labSheets.measured,
  pointCount: labSheets.pointCount,
  submittedAt: labSheets.submittedAt,
  updatedAt: labSheets.updatedAt,
}
type ListedSheet = { [K in keyof typeof listColumns]: LabSheet[K] }

/** "My lab sheets", or (classId) the sheets handed in to a class the caller teaches. */
export async function listSheets(user: User, query: { classId?: number, status?: LabSheet['status'] }) {
  const db = useDB()
  if (query.classId !== undefined) {
    await requireClassInstructor(user, query.classId)
    const rows = await db.select({ ...listColumns, owner: users.name }).from(labSheets)
      .innerJoin(users, eq(users.id, labSheets.ownerId))
      .where(and(eq(labSheets.classId, query.classId), ne(labSheets.status, 'draft'), query.status ? eq(labSheets.status, query.status) : undefined))
      .orderBy(desc(labSheets.submittedAt), desc(labSheets.id))
    const counts = await pointCounts(rows)
    return rows.map(r => summary(r, r.owner, counts))
  }
  const rows = await db.select(listColumns).from(labSheets)
    .where(and(eq(labSheets.ownerId, user.id), query.status ? eq(labSheets.status, query.status) : undefined))
    .orderBy(desc(labSheets.updatedAt), desc(labSheets.id))
  const counts = await pointCounts(rows)
  return rows.map(s => summary(s, user.name, counts))
}

/** Point counts of listed sheets that have none stored yet (made before they were): worked out and stored once. */
async function pointCounts(rows: ListedSheet[]): Promise<Map<number, number>> {
  const missing = rows.filter(r => r.pointCount === null).map(r => r.id)
  const counts = new Map<number, number>()
  if (missing.length === 0) return counts
  const sheets = await useDB().select({ id: labSheets.id, document: labSheets.document, points: labSheets.points }).from(labSheets).where(inArray(labSheets.id, missing))
  for (const sheet of sheets) {
    const points = await storedPoints(sheet)
    if (sheet.points) await useDB().update(labSheets).set({ pointCount: points.length }).where(and(eq(labSheets.id, sheet.id), isNull(labSheets.pointCount)))
    counts.set(sheet.id, points.length)
  }
  return counts
}

function summary(sheet: ListedSheet, owner: string, counts: Map<number, number>) {
  // measured holds known point ids only (updateSheet checks them), so the numbers in it are the points taken
  const taken = Object.values(sheet.measured).filter(v => typeof v === 'number').length
  const points = sheet.pointCount ?? counts.get(sheet.id) ?? 0
  return { id: sheet.id, title: sheet.title, owner, status: sheet.status, classId: sheet.classId, points, taken, submittedAt: sheet.submittedAt?.toISOString() ?? null, updatedAt: sheet.updatedAt.toISOString() }
}

/** One sheet as CSV: a row per test point. */
export function sheetCsv(view: Awaited<ReturnType<typeof sheetView>>): string {
  const header = ['step', 'reading', 'from', 'to', 'expected_volts', 'measured_volts', 'deviation_percent', 'status', 'likely_cause']
  return csvText(header, view.comparison.rows.map(r => [r.point.step, r.point.label, r.point.from, r.point.to, r.expectedVolts, r.measuredVolts, r.deviationPercent, r.status, r.cause]))
}
