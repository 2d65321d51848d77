// The whole fault-hunt flow against the built server and MariaDB: an instructor makes a
// class and invites a student by e-mail, hides a reversed unit in a bank, publishes; the
// student joins, probes, closes the delta onto the fault, submits; the instructor reads the
// results and the CSV.
import { beforeAll, describe, expect, it } from 'vitest'
import { solve } from '../../shared/engine'
import { starterBySlug } from '../../shared/starters'
import { api, databaseURL } from './helpers'
import { as, firstLink, mailTo, newPerson, signIn, type Person } from './people'

type Doc = { components: { id: string, kind: string, closed?: boolean, blown?: boolean }[], wires: [string, string][] } & Record<string, unknown>

const practice = starterBySlug('closing-check-practice')!.document as unknown as Doc
const withBreaker = (doc: Doc, closed: boolean): Doc => ({ ...doc, components: doc.components.map(c => (c.kind === 'breaker' ? { ...c, closed } : c)) })
const closeCorner = (doc: Doc): Doc => ({ ...doc, wires: [...doc.wires, ['T3.X4', 'T1.X1']] })

let instructor: Person
let student: Person
let outsider: Person
let otherInstructor: Person
let classId = 0
let otherClassId = 0
let huntId = 0
let attemptId = 0
let document: Doc

beforeAll(async () => {
  instructor = await newPerson('instructor', databaseURL, 'hunt-teacher')
  otherInstructor = await newPerson('instructor', databaseURL, 'hunt-other-teacher')
  student = await newPerson('student', databaseURL, 'hunt-student')
  outsider = await newPerson('student', databaseURL, 'hunt-outsider')
})

describe('a class', () => {
  it('is made by an instructor, with a join code and an empty roster', async () => {
    const made = await instructor.call('/api/classes', { method: 'POST', json: { name: 'Flow class', term: 'Spring', tolerancePercent: 4 } })
    expect(made.status, made.text).toBe(201)
    expect(made.body.joinCode).toMatch(/^[A-HJ-NP-Z2-9]{8}$/)
    expect(made.body.roster).toEqual([])
    expect(made.body.tolerancePercent).toBe(4)
    classId = made.body.id
    const other = await otherInstructor.call('/api/classes', { method: 'POST', json: { name: 'Another class' } })
    otherClassId = other.body.id
    expect((await outsider.call('/api/classes/join', { method: 'POST', json: { code: other.body.joinCode } })).status).toBe(200)
  })

  it('invites a student by e-mail; the link joins once', async () => {
    const invited = await instructor.call(`/api/classes/${classId}/invitations`, { method: 'POST', json: { emails: [student.email] } })
    expect(invited.status, invited.text).toBe(201)
    const mail = await mailTo(student.email)
    expect(mail.subject).toContain('Flow class')
    const link = firstLink(mail.text)
    expect(link.pathname).toBe('/classes/join')
    const token = link.searchParams.get('token')!
    // the landing page names the class before the link is used, and looking does not use it
    const preview = (who: Person | null, t = token) => (who ? who.call : api)('/api/classes/invitation', { method: 'POST', json: { token: t } })
    expect((await preview(null)).status).toBe(401)
    const seen = await preview(student)
    expect(seen.status, seen.text).toBe(200)
    expect(seen.body).toMatchObject({ className: 'Flow class', term: 'Spring', instructorName: instructor.name, youTeachIt: false })
    expect(new Date(seen.body.expiresAt).getTime()).toBeGreaterThan(Date.now() + 13 * 86_400_000)
    expect(seen.body).not.toHaveProperty('joinCode')
    expect((await preview(instructor)).body.youTeachIt).toBe(true)
    const wrong = await preview(student, `${token.slice(0, -4)}AAAA`)
    expect(wrong.status).toBe(404)
    expect(wrong.body.statusMessage).toMatch(/wrong, expired or already used/)
    expect((await preview(student, 'short')).status).toBe(400)
    const joined = await student.call('/api/classes/join', { method: 'POST', json: { token } })
    expect(joined.status, joined.text).toBe(200)
    expect(joined.body).toEqual({ id: classId, name: 'Flow class' })
    const again = await outsider.call('/api/classes/join', { method: 'POST', json: { token } })
    expect(again.status).toBe(404)
    expect((await preview(outsider)).status).toBe(404)
    const detail = await instructor.call(`/api/classes/${classId}`)
    expect(detail.body.roster.map((r: { email: string }) => r.email)).toEqual([student.email])
  })

  it('shows a member the class without the roster or code, and nobody else at all', async () => {
    const seen = await student.call(`/api/classes/${classId}`)
    expect(seen.status).toBe(200)
    expect(seen.body.as).toBe('member')
    expect(seen.body).not.toHaveProperty('roster')
    expect(seen.body).not.toHaveProperty('joinCode')
    expect((await outsider.call(`/api/classes/${classId}`)).status).toBe(404)
    expect((await otherInstructor.call(`/api/classes/${classId}`)).status).toBe(404)
    expect((await otherInstructor.call(`/api/classes/${classId}`, { method: 'PATCH', json: { name: 'taken over' } })).status).toBe(404)
  })
})

describe('a fault hunt', () => {
  it('is authored from one of the instructor\'s banks with a hidden reversed unit', async () => {
    const bank = await instructor.call('/api/banks', { method: 'POST', json: { name: 'hunt source', document: practice } })
    expect(bank.status).toBe(201)
    const notMine = await otherInstructor.call('/api/hunts', { method: 'POST', json: { bankId: bank.body.id, title: 'stolen', faults: [{ kind: 'secondary-reversed', component: 'T2' }] } })
    expect(notMine.status).toBe(404)
    const badFault = await instructor.call('/api/hunts', { method: 'POST', json: { bankId: bank.body.id, title: 'x', faults: [{ kind: 'secondary-reversed', component: 'T9' }] } })
    expect(badFault.status).toBe(400)
    expect(badFault.body.data.errors).toEqual([{ path: 'faults[0].component', message: 'the bank has no component "T9"' }])
    const made = await instructor.call('/api/hunts', {
      method: 'POST',
      json: { bankId: bank.body.id, title: 'Which unit is backwards?', instructions: 'Take the closing check first.', faults: [{ kind: 'secondary-reversed', component: 'T2' }], probeBudget: 25 },
    })
    expect(made.status, made.text).toBe(201)
    expect(made.body.faults).toEqual([{ kind: 'secondary-reversed', component: 'T2' }])
    huntId = made.body.id
  })

  it('publishes to the instructor\'s own classes only, and mails the students', async () => {
    const foreign = await instructor.call(`/api/hunts/${huntId}/publish`, { method: 'POST', json: { classIds: [otherClassId] } })
    expect(foreign.status).toBe(404)
    // mail goes out from the queue a moment after the answer: wait for one newer than the invitation
    const since = String(Date.now())
    const published = await instructor.call(`/api/hunts/${huntId}/publish`, { method: 'POST', json: { classIds: [classId] } })
    expect(published.status, published.text).toBe(200)
    expect(published.body.mailed).toBe(1)
    const notice = await mailTo(student.email, { after: since })
    expect(notice.subject).toBe('New fault hunt: Which unit is backwards?')
    expect(firstLink(notice.text).pathname).toBe(`/hunts/${huntId}`)
  })

  it('is listed for the member and hidden from everyone else', async () => {
    const list = await student.call('/api/hunts')
    expect(list.body.assigned.map((h: { id: number }) => h.id)).toContain(huntId)
    expect((await outsider.call('/api/hunts')).body.assigned.map((h: { id: number }) => h.id)).not.toContain(huntId)
    expect((await outsider.call(`/api/hunts/${huntId}`)).status).toBe(404)
    expect((await outsider.call(`/api/hunts/${huntId}/attempts`, { method: 'POST' })).status).toBe(404)
    expect((await otherInstructor.call(`/api/hunts/${huntId}/attempts`)).status).toBe(404)
  })
})

describe('an attempt', () => {
  it('starts from the bank as the students see it, and resumes the same attempt', async () => {
    const started = await student.call(`/api/hunts/${huntId}/attempts`, { method: 'POST' })
    expect(started.status, started.text).toBe(200)
    attemptId = started.body.id
    document = started.body.document
    expect(document.wires).toEqual(practice.wires)
    const again = await student.call(`/api/hunts/${huntId}/attempts`, { method: 'POST' })
    expect(again.body.id).toBe(attemptId)
    expect((await outsider.call(`/api/attempts/${attemptId}`)).status).toBe(404)
  })

  it('reads the closing check from the server: ≈ 2 × 240 V with the hidden reversed unit (0 V on the bank as drawn)', async () => {
    const dead = await student.call(`/api/attempts/${attemptId}/probe`, { method: 'POST', json: { document, from: 'MC.a', to: 'MC.b' } })
    expect(dead.status, dead.text).toBe(200)
    expect(dead.body).toMatchObject({ volts: 0, energized: false, probesUsed: 1, probeBudget: 25 })

    const live = withBreaker(document, true)
    // the same wiring solved without the fault: the corner reads near 0 V
    expect(solve(live).meters.MC!.volts).toBeLessThan(1)
    const check = await student.call(`/api/attempts/${attemptId}/probe`, { method: 'POST', json: { document: live, from: 'MC.a', to: 'MC.b' } })
    expect(check.status, check.text).toBe(200)
    expect(check.body.energized).toBe(true)
    // common practice: one unit backwards in a delta puts about twice the coil voltage (2 × 240 V) across the gap
    expect(check.body.volts).toBeGreaterThan(470)
    expect(check.body.volts).toBeLessThan(490)
    expect(check.body.unsafeClosure).toBe(false)
    const coil = await student.call(`/api/attempts/${attemptId}/probe`, { method: 'POST', json: { document: live, from: 'T2.X1', to: 'T2.X4' } })
    expect(coil.body.volts).toBeCloseTo(240, -1)
    expect(coil.body.probesUsed).toBe(3)
  })

  it('records closing the delta onto the fault as an unsafe closure, with the fuse it blows', async () => {
    const closed = closeCorner(withBreaker(document, true))
    const energized = await student.call(`/api/attempts/${attemptId}/energize`, { method: 'POST', json: { document: closed } })
    expect(energized.status, energized.text).toBe(200)
    expect(energized.body.unsafeClosure).toBe(true)
    expect(energized.body.unsafeClosures).toBe(1)
    expect(energized.body.liveRewires).toBe(1)
    expect(energized.body.events.length).toBeGreaterThan(0)
    const opened = energized.body.events[0].device
    expect(['F1', 'F2', 'F3', 'CB1']).toContain(opened)
    expect(Object.keys(energized.body.devices).sort()).toEqual(['CB1', 'F1', 'F2', 'F3'])
    const stored = await student.call(`/api/attempts/${attemptId}`)
    const part = stored.body.document.components.find((c: { id: string }) => c.id === opened)
    expect(part.kind === 'fuse' ? part.blown : !part.closed).toBe(true)
  })

  it('takes the diagnosis, says it is right, and is read-only afterwards', async () => {
    const wrongShape = await student.call(`/api/attempts/${attemptId}/submit`, { method: 'POST', json: { diagnosis: [{ component: 'T2', diagnosis: 'backwards' }] } })
    expect(wrongShape.status).toBe(400)
    expect(wrongShape.body.data.errors[0].path).toBe('diagnosis[0].diagnosis')
    const submitted = await student.call(`/api/attempts/${attemptId}/submit`, { method: 'POST', json: { diagnosis: [{ component: 'T2', diagnosis: 'polarity-reversed' }] } })
    expect(submitted.status, submitted.text).toBe(200)
    expect(submitted.body.status).toBe('submitted')
    expect(submitted.body.feedback).toEqual({ correct: true, findings: [{ component: 'T2', diagnosis: 'polarity-reversed', right: true }] })
    const late = await student.call(`/api/attempts/${attemptId}/probe`, { method: 'POST', json: { document, from: 'MC.a', to: 'MC.b' } })
    expect(late.status).toBe(409)
    expect((await student.call(`/api/attempts/${attemptId}/submit`, { method: 'POST', json: { diagnosis: [{ component: 'T1', diagnosis: 'coil-open' }] } })).status).toBe(409)
  })

  it('shows the instructor a results row, a summary and a CSV', async () => {
    const results = await instructor.call(`/api/hunts/${huntId}/attempts`)
    expect(results.status, results.text).toBe(200)
    const row = results.body.rows.find((r: { email: string }) => r.email === student.email)
    expect(row).toMatchObject({ status: 'submitted', probesUsed: 3, unsafeClosures: 1, liveRewires: 1, correct: true })
    expect(row.operations).toBeGreaterThan(0)
    expect(results.body.summary).toMatchObject({ submitted: 1, found: 1, foundShare: 1, medianProbes: 3, unsafeClosures: 1 })
    const csv = await instructor.call(`/api/hunts/${huntId}/attempts?format=csv`)
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toContain('text/csv')
    const lines = csv.text.trim().split('\r\n')
    expect(lines[0]).toBe('student,email,status,probesUsed,unsafeClosures,liveRewires,operations,timeSpentSeconds,correct,startedAt,submittedAt')
    expect(lines[1]).toContain(`${student.name},${student.email},submitted,3,1,1,`)
    const view = await instructor.call(`/api/attempts/${attemptId}`)
    expect(view.body.probes.map((p: { from: string, to: string }) => `${p.from}-${p.to}`)).toEqual(['MC.a-MC.b', 'MC.a-MC.b', 'T2.X1-T2.X4'])
  })

  it('keeps the faults fixed once a student has started', async () => {
    const change = await instructor.call(`/api/hunts/${huntId}`, { method: 'PATCH', json: { faults: [{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }] } })
    expect(change.status).toBe(409)
    const rename = await instructor.call(`/api/hunts/${huntId}`, { method: 'PATCH', json: { title: 'Which unit is backwards? (week 3)' } })
    expect(rename.status).toBe(200)
    expect(rename.body.title).toBe('Which unit is backwards? (week 3)')
  })
})

describe('probe limits', () => {
  async function freshAttempt(budget: number | null) {
    const bank = await instructor.call('/api/banks', { method: 'POST', json: { name: 'limit source', document: practice } })
    const hunt = await instructor.call('/api/hunts', { method: 'POST', json: { bankId: bank.body.id, title: 'limits', faults: [{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }], probeBudget: budget } })
    await instructor.call(`/api/hunts/${hunt.body.id}/publish`, { method: 'POST', json: { classIds: [classId] } })
    const attempt = await student.call(`/api/hunts/${hunt.body.id}/attempts`, { method: 'POST' })
    return { id: attempt.body.id as number, document: attempt.body.document as Doc }
  }

  it('stops at the probe budget', async () => {
    const attempt = await freshAttempt(2)
    const probe = () => student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: 'T1.X1', to: 'T1.X2' } })
    expect((await probe()).status).toBe(200)
    expect((await probe()).status).toBe(200)
    const third = await probe()
    expect(third.status).toBe(409)
    expect(third.body.statusMessage).toContain('budget of 2')
  })

  it('refuses probes that come too fast for one attempt (429 with Retry-After)', async () => {
    const attempt = await freshAttempt(null)
    const statuses: number[] = []
    let retryAfter: string | null = null
    for (let i = 0; i < 32; i++) {
      const r = await student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: 'T1.X1', to: 'T1.X4' } })
      statuses.push(r.status)
      if (r.status === 429) retryAfter = r.headers.get('retry-after')
    }
    expect(statuses.slice(0, 30).every(s => s === 200)).toBe(true)
    expect(statuses.slice(30)).toEqual([429, 429])
    expect(Number(retryAfter)).toBeGreaterThan(0)
  })

  it('refuses a document that adds or drops a part, naming it', async () => {
    const attempt = await freshAttempt(null)
    const extra = { ...attempt.document, components: [...attempt.document.components, { id: 'L9', kind: 'load', ohms: 1 }] }
    const added = await student.call(`/api/attempts/${attempt.id}/energize`, { method: 'POST', json: { document: extra } })
    expect(added.status).toBe(400)
    expect(added.body.data.errors[0].message).toContain('L9 is not part of this hunt')
    const fewer = { ...attempt.document, components: attempt.document.components.filter(c => c.id !== 'T3'), wires: attempt.document.wires.filter(w => !w.some(t => t.startsWith('T3.'))) }
    const dropped = await student.call(`/api/attempts/${attempt.id}/energize`, { method: 'POST', json: { document: fewer } })
    expect(dropped.status).toBe(400)
    expect(dropped.body.data.errors[0].message).toContain('T3 is missing')
  })
})

describe('the demo scenario', () => {
  it('has a class with both demo students and a hunt published to it', async () => {
    for (const email of ['student@phaseloom.test', 'student2@phaseloom.test']) {
      const cookie = await signIn(email, 'phaseloom-demo')
      const call = as(cookie)
      const classes = await call('/api/classes')
      expect(classes.body.map((c: { name: string }) => c.name)).toContain('Transformer Lab A')
      const hunts = await call('/api/hunts')
      const demo = hunts.body.assigned.find((h: { title: string }) => h.title === 'Bay 4: one unit is not what it seems')
      expect(demo, email).toBeDefined()
      expect(JSON.stringify((await call(`/api/hunts/${demo.id}`)).body)).not.toMatch(/secondary-reversed|"faults"/)
    }
  })
})

describe('probing a part the student does not have', () => {
  it('is refused, even where the hidden fault adds a part to the bank (an open coil)', async () => {
    const bank = await instructor.call('/api/banks', { method: 'POST', json: { name: 'hidden part', document: practice } })
    const hunt = await instructor.call('/api/hunts', { method: 'POST', json: { bankId: bank.body.id, title: 'hidden part', faults: [{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }] } })
    await instructor.call(`/api/hunts/${hunt.body.id}/publish`, { method: 'POST', json: { classIds: [classId] } })
    const attempt = (await student.call(`/api/hunts/${hunt.body.id}/attempts`, { method: 'POST' })).body
    const r = await student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: 'open1.a', to: 'T1.X1' } })
    expect(r.status).toBe(400)
    expect(r.body.data.errors).toEqual([{ path: 'from', message: '"open1.a" is not a terminal of this bank' }])
  })
})
