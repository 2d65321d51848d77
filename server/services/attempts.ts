/**
 * A student's attempt at a fault hunt. Every reading is computed here, on the bank with its
 * hidden faults applied; what goes back names only the student's own terminals and parts.
 */
import { createHash } from 'node:crypto'
import type { H3Event } from 'h3'
import { and, asc, eq, isNull, lt, or, sql } from 'drizzle-orm'
import { DIAGNOSIS_OF, type Diagnosis } from '#shared/hunts/faults'
import type { Settled } from '#shared/hunts/settle'
import type { Attempt, Hunt, User } from '../db/schema'
import { huntCircuit, huntNotFound, requireHuntForMember, studentView } from './hunts'

const { attempts, attemptProbes, hunts, users } = tables

function attemptNotFound() {
  return createError({ statusCode: 404, statusMessage: 'No such attempt' })
}

/** The bank a student starts from: the hunt's bank, without the secondary jumpers unless it comes pre-wired. */
export function startingDocument(hunt: Hunt): Record<string, unknown> {
  const document = structuredClone(hunt.document)
  if (hunt.secondaryPrewired) return document
  const circuit = huntCircuit(hunt)
  const units = new Set(circuit.components.filter(c => c.kind === 'transformer').map(c => c.id))
  const onSecondary = (t: string) => {
    const [id, terminal] = t.split('.')
    return units.has(id!) && /^X[1-4]$/.test(terminal!)
  }
  document.wires = (circuit.wires as [string, string][]).filter(([a, b]) => !onSecondary(a) && !onSecondary(b))
  return document
}

/** Starts the caller's attempt, or hands back the one they have. */
export async function startAttempt(student: User, huntId: number) {
  const hunt = await requireHuntForMember(student, huntId)
  const db = useDB()
  await db.insert(attempts).values({ huntId: hunt.id, studentId: student.id, document: startingDocument(hunt) })
    .onDuplicateKeyUpdate({ set: { lastActivityAt: sql`last_activity_at` } })
  const [attempt] = await db.select().from(attempts).where(and(eq(attempts.huntId, hunt.id), eq(attempts.studentId, student.id)))
  return studentAttemptView(attempt!, hunt)
}

/** The attempt and its hunt if `user` may read it: their own, or one of the hunts they wrote. */
async function readableAttempt(user: User, id: number): Promise<{ attempt: Attempt, hunt: Hunt, as: 'student' | 'author' }> {
  const [row] = await useDB().select({ attempt: attempts, hunt: hunts }).from(attempts)
    .innerJoin(hunts, eq(hunts.id, attempts.huntId))
    .where(and(eq(attempts.id, id), isNull(hunts.deletedAt), or(eq(attempts.studentId, user.id), eq(hunts.authorId, user.id))))
  if (!row) throw attemptNotFound()
  return { ...row, as: row.attempt.studentId === user.id ? 'student' : 'author' }
}

/** The caller's own attempt, still open, at a hunt still published to one of their classes; else 404 or 409. */
async function openAttempt(student: User, id: number): Promise<{ attempt: Attempt, hunt: Hunt }> {
  const [attempt] = await useDB().select().from(attempts).where(and(eq(attempts.id, id), eq(attempts.studentId, student.id)))
  if (!attempt) throw attemptNotFound()
  let hunt: Hunt
  try {
    hunt = await requireHuntForMember(student, attempt.huntId)
  }
  catch {
    throw attemptNotFound()
  }
  if (attempt.status !== 'in-progress') throw createError({ statusCode: 409, statusMessage: 'This attempt was submitted: it is read-only now' })
  if (hunt.dueAt && hunt.dueAt.getTime() < Date.now()) throw createError({ statusCode: 409, statusMessage: `This hunt closed on ${hunt.dueAt.toUTCString()}` })
  return { attempt, hunt }
}

function feedbackOpen(hunt: Hunt, attempt: Attempt): boolean {
  if (attempt.status !== 'submitted') return false
  return hunt.feedback === 'on-submit' || (hunt.dueAt !== null && hunt.dueAt.getTime() <= Date.now())
}

/** Right or wrong, finding by finding; never what the faults are. */
function feedbackOf(hunt: Hunt, attempt: Attempt) {
  if (!feedbackOpen(hunt, attempt)) return null
  const truth = new Set(hunt.faults.map(f => `${f.component}:${DIAGNOSIS_OF[f.kind]}`))
  return {
    correct: attempt.correct === true,
    findings: (attempt.diagnosis ?? []).map(d => ({ component: d.component, diagnosis: d.diagnosis, right: truth.has(`${d.component}:${d.diagnosis}`) })),
  }
}

async function probeLog(attemptId: number) {
  const rows = await useDB().select().from(attemptProbes).where(eq(attemptProbes.attemptId, attemptId)).orderBy(asc(attemptProbes.id)).limit(1000)
  return rows.map(p => ({ from: p.fromTerminal, to: p.toTerminal, volts: Number(p.volts), degrees: Number(p.degrees), energized: p.energized, at: p.takenAt.toISOString() }))
}

function counters(attempt: Attempt, hunt: Hunt) {
  return {
    probesUsed: attempt.probesUsed,
    probeBudget: hunt.probeBudget,
    unsafeClosures: attempt.unsafeClosures,
    liveRewires: attempt.liveRewires,
    operations: attempt.operations,
  }
}

async function studentAttemptView(attempt: Attempt, hunt: Hunt) {
  const [author] = await useDB().select({ name: users.name }).from(users).where(eq(users.id, hunt.authorId))
  return {
    id: attempt.id,
    hunt: studentView(hunt, author?.name ?? '', { id: attempt.id, status: attempt.status }),
    status: attempt.status,
    document: attempt.document,
    ...counters(attempt, hunt),
    energized: attempt.liveWiring !== null,
    probes: await probeLog(attempt.id),
    diagnosis: attempt.diagnosis,
    startedAt: attempt.startedAt.toISOString(),
    submittedAt: attempt.submittedAt?.toISOString() ?? null,
    feedback: feedbackOf(hunt, attempt),
  }
}

/** GET /api/attempts/[id]: the student's own view, or (for the hunt's author) the same with who it is and whether it was right. */
export async function attemptFor(user: User, id: number) {
  const { attempt, hunt, as } = await readableAttempt(user, id)
  const view = await studentAttemptView(attempt, hunt)
  if (as === 'student') return view
  const [student] = await useDB().select({ name: users.name, email: users.email }).from(users).where(eq(users.id, attempt.studentId))
  return { ...view, student: student ?? null, correct: attempt.correct }
}

/** Solves the student's bank with the hunt's faults in it, in the engine's pool (shared/hunts/settle.ts). */
async function settle(hunt: Hunt, document: Record<string, unknown>, probe?: { from: string, to: string }): Promise<Settled> {
  const outcome = await runEngine('settleAttempt', { hunt: { document: hunt.document, faults: hunt.faults }, document, probe })
  if (!outcome.ok) throw engineFailure(outcome)
  return outcome
}

function wiringHash(document: Record<string, unknown>): string {
  const wires = (document.wires as [string, string][]).map(([a, b]) => (a < b ? `${a}|${b}` : `${b}|${a}`)).sort()
  return createHash('sha256').update(wires.join('\n')).digest('hex')
}

/** What a student may see of a solve: their own parts' states and operations, nothing else. */
function visibleOutcome(settled: Settled, bench: Record<string, unknown>) {
  const ids = new Set((bench.components as { id: string }[]).map(c => c.id))
  const devices: Record<string, { state: string, amps: number }> = {}
  for (const [id, d] of Object.entries(settled.result.devices)) if (ids.has(id)) devices[id] = { state: d.state, amps: d.amps }
  return {
    energized: settled.result.energized,
    devices,
    events: settled.result.events.filter(e => ids.has(e.device)).map(e => ({ device: e.device, action: e.action, state: e.state, region: e.region, amps: e.amps, seconds: e.seconds })),
  }
}

/**
 * Records what energizing this wiring did: a change of wiring while live is a live rewire,
 * a newly energized wiring that draws fault current or closes a loop onto a voltage is an
 * unsafe closure, and every protective operation counts.
 */
async function record(attempt: Attempt, settled: Settled, extra: { probeBudget?: number | null } = {}) {
  const probe = extra.probeBudget !== undefined
  const live = settled.result.energized ? wiringHash(settled.document) : null
  const fresh = live !== null && live !== attempt.liveWiring
  const rewiredLive = fresh && attempt.liveWiring !== null
  const unsafe = fresh && settled.unsafe
  const [result] = await useDB().update(attempts).set({
    document: settled.document,
    liveWiring: live,
    liveRewires: rewiredLive ? sql`${attempts.liveRewires} + 1` : undefined,
    unsafeClosures: unsafe ? sql`${attempts.unsafeClosures} + 1` : undefined,
    operations: settled.result.events.length ? sql`${attempts.operations} + ${settled.result.events.length}` : undefined,
    probesUsed: probe ? sql`${attempts.probesUsed} + 1` : undefined,
    lastActivityAt: new Date(),
  }).where(and(
    eq(attempts.id, attempt.id),
    eq(attempts.status, 'in-progress'),
    // the budget is checked in the UPDATE itself, so parallel probes cannot pass it together
    probe && extra.probeBudget !== null ? lt(attempts.probesUsed, extra.probeBudget!) : undefined,
  ))
  return { unsafeClosure: unsafe, liveRewire: rewiredLive, recorded: result.affectedRows === 1 }
}

async function reread(id: number): Promise<Attempt> {
  const [attempt] = await useDB().select().from(attempts).where(eq(attempts.id, id))
  return attempt!
}

export async function energize(student: User, id: number, document: Record<string, unknown>) {
  const { attempt, hunt } = await openAttempt(student, id)
  const settled = await settle(hunt, document)
  const { unsafeClosure, liveRewire } = await record(attempt, settled)
  const now = await reread(id)
  return { ...visibleOutcome(settled, settled.document), unsafeClosure, liveRewire, ...counters(now, hunt) }
}

function budgetUsedUp(budget: number) {
  return createError({ statusCode: 409, statusMessage: `The probe budget of ${budget} is used up: submit your diagnosis` })
}

export async function probe(event: H3Event, student: User, id: number, body: { document: Record<string, unknown>, from: string, to: string }) {
  const { attempt, hunt } = await openAttempt(student, id)
  if (hunt.probeBudget !== null && attempt.probesUsed >= hunt.probeBudget) throw budgetUsedUp(hunt.probeBudget)
  await consumeProbe(event, attempt.id)
  // a document that is not the hunt's bank, or a terminal it does not have: 400, and nothing counted
  const settled = await settle(hunt, body.document, { from: body.from, to: body.to })
  const { recorded, ...happened } = await record(attempt, settled, { probeBudget: hunt.probeBudget })
  if (!recorded) {
    const now = await reread(id)
    if (now.status !== 'in-progress') throw createError({ statusCode: 409, statusMessage: 'This attempt was submitted: it is read-only now' })
    throw budgetUsedUp(hunt.probeBudget ?? 0)
  }
  const reading = settled.reading!
  await useDB().insert(attemptProbes).values({ attemptId: attempt.id, fromTerminal: body.from, toTerminal: body.to, volts: reading.volts, degrees: reading.degrees, energized: settled.result.energized })
  const now = await reread(id)
  return { from: body.from, to: body.to, ...reading, ...visibleOutcome(settled, settled.document), ...happened, ...counters(now, hunt) }
}

export async function submit(student: User, id: number, body: { diagnosis: { component: string, diagnosis: Diagnosis }[], document?: Record<string, unknown> }) {
  const { attempt, hunt } = await openAttempt(student, id)
  const truth = new Set(hunt.faults.map(f => `${f.component}:${DIAGNOSIS_OF[f.kind]}`))
  const named = new Set(body.diagnosis.map(d => `${d.component}:${d.diagnosis}`))
  const correct = named.size === truth.size && [...named].every(k => truth.has(k))
  const [result] = await useDB().update(attempts).set({
    status: 'submitted',
    diagnosis: body.diagnosis,
    correct,
    submittedAt: new Date(),
    lastActivityAt: new Date(),
    ...(body.document ? { document: body.document } : {}),
  }).where(and(eq(attempts.id, attempt.id), eq(attempts.status, 'in-progress')))
  if (result.affectedRows !== 1) throw createError({ statusCode: 409, statusMessage: 'This attempt was submitted: it is read-only now' })
  return studentAttemptView(await reread(id), hunt)
}

/** The author's results table: every attempt, and every member of a published class who has not started. */
export async function huntResults(author: User, huntId: number) {
  const [hunt] = await useDB().select().from(hunts).where(and(eq(hunts.id, huntId), eq(hunts.authorId, author.id), isNull(hunts.deletedAt)))
  if (!hunt) throw huntNotFound()
  const db = useDB()
  const rows = await db.select({ attempt: attempts, name: users.name, email: users.email }).from(attempts)
    .innerJoin(users, eq(users.id, attempts.studentId))
    .where(eq(attempts.huntId, huntId)).orderBy(asc(users.name))
  const waiting = await db.execute(sql`
    select distinct u.id, u.name, u.email from ${tables.huntClasses} hc
    join ${tables.classMembers} cm on cm.class_id = hc.class_id
    join ${users} u on u.id = cm.user_id
    where hc.hunt_id = ${huntId}
      and not exists (select 1 from ${attempts} a where a.hunt_id = ${huntId} and a.student_id = u.id)
    order by u.name`)
  const notStarted = (waiting[0] as unknown as { id: number, name: string, email: string }[])
  const table = [
    ...rows.map(({ attempt: a, name, email }) => ({
      attemptId: a.id,
      studentId: a.studentId,
      student: name,
      email,
      status: a.status,
      probesUsed: a.probesUsed,
      unsafeClosures: a.unsafeClosures,
      liveRewires: a.liveRewires,
      operations: a.operations,
      timeSpentSeconds: Math.max(0, Math.round(((a.submittedAt ?? a.lastActivityAt).getTime() - a.startedAt.getTime()) / 1000)),
      correct: a.status === 'submitted' ? a.correct : null,
      startedAt: a.startedAt.toISOString(),
      submittedAt: a.submittedAt?.toISOString() ?? null,
    })),
    ...notStarted.map(s => ({
      attemptId: null, studentId: s.id, student: s.name, email: s.email, status: 'not-started' as const,
      probesUsed: 0, unsafeClosures: 0, liveRewires: 0, operations: 0, timeSpentSeconds: 0, correct: null, startedAt: null, submittedAt: null,
    })),
  ]
  const submitted = table.filter(r => r.status === 'submitted')
  const probes = submitted.map(r => r.probesUsed).sort((a, b) => a - b)
  const median = probes.length === 0 ? null : probes.length % 2 ? probes[(probes.length - 1) / 2]! : (probes[probes.length / 2 - 1]! + probes[probes.length / 2]!) / 2
  return {
    hunt: { id: hunt.id, title: hunt.title, dueAt: hunt.dueAt?.toISOString() ?? null, probeBudget: hunt.probeBudget },
    rows: table,
    summary: {
      students: table.length,
      submitted: submitted.length,
      found: submitted.filter(r => r.correct).length,
      foundShare: submitted.length ? submitted.filter(r => r.correct).length / submitted.length : null,
      medianProbes: median,
      unsafeClosures: table.reduce((n, r) => n + r.unsafeClosures, 0),
    },
  }
}

const CSV_COLUMNS = ['student', 'email', 'status', 'probesUsed', 'unsafeClosures', 'liveRewires', 'operations', 'timeSpentSeconds', 'correct', 'startedAt', 'submittedAt'] as const

/** The results table as CSV, one row per student. */
export function resultsCsv(rows: Awaited<ReturnType<typeof huntResults>>['rows']): string {
  return csvText(CSV_COLUMNS, rows.map(r => CSV_COLUMNS.map(c => r[c])))
}
