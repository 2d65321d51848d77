// No answer a student can get ever holds a hunt's faults: one hunt of each fault kind (with
// parameters chosen to be recognisable), and every route and page a student can reach,
// walked through a whole attempt (start, probes, energize, submit, read back).
import { beforeAll, describe, expect, it } from 'vitest'
import { FAULT_KINDS, type Fault } from '../../shared/hunts/faults'
import { starterBySlug } from '../../shared/starters'
import { databaseURL } from './helpers'
import { newPerson, type Person } from './people'

type Doc = { components: { id: string, kind: string, closed?: boolean }[], wires: [string, string][] } & Record<string, unknown>
const practice = starterBySlug('closing-check-practice')!.document as unknown as Doc

// one hunt per kind; the numbers are unusual on purpose, so finding them means a leak
const FAULTS: Fault[] = [
  { kind: 'secondary-reversed', component: 'T1' },
  { kind: 'primary-reversed', component: 'T2' },
  { kind: 'open-coil', component: 'T3', coil: 'X3-X4' },
  { kind: 'wrong-tap', component: 'T1', percent: 13.7 },
  { kind: 'coil-volts', component: 'T2', volts: [104.3, 120] },
  { kind: 'phases-relabelled', component: 'S1', swap: ['B', 'C'] },
]

/** What must never appear in anything sent to a student. */
const FORBIDDEN: { what: string, pattern: RegExp }[] = [
  { what: 'a "faults" field', pattern: /"faults"\s*:/ },
  ...FAULT_KINDS.map(kind => ({ what: `the fault kind ${kind}`, pattern: new RegExp(kind) })),
  { what: 'the wrong-tap percent', pattern: /(?<![\d.])13\.7(?![\d])/ },
  { what: 'the off-nameplate coil volts', pattern: /(?<![\d.])104\.3(?![\d])/ },
  { what: 'a "percent" field', pattern: /"percent"/ },
  { what: 'a "swap" field', pattern: /"swap"/ },
  { what: 'a "coil" field', pattern: /"coil"/ },
  { what: 'the hidden open-coil part', pattern: /open1/ },
]

let instructor: Person
let student: Person
let classId = 0
const hunts: { fault: Fault, id: number }[] = []
const seen: { where: string, text: string }[] = []

async function look(where: string, response: Promise<{ status: number, text: string }>, expected = 200) {
  const r = await response
  expect(r.status, `${where}: ${r.text}`).toBe(expected)
  seen.push({ where, text: r.text })
  return r
}

beforeAll(async () => {
  instructor = await newPerson('instructor', databaseURL, 'leak-teacher')
  student = await newPerson('student', databaseURL, 'leak-student')
  const klass = await instructor.call('/api/classes', { method: 'POST', json: { name: 'Leak class' } })
  classId = klass.body.id
  await student.call('/api/classes/join', { method: 'POST', json: { code: klass.body.joinCode } })
  const bank = await instructor.call('/api/banks', { method: 'POST', json: { name: 'leak source', document: practice } })
  for (const fault of FAULTS) {
    const made = await instructor.call('/api/hunts', { method: 'POST', json: { bankId: bank.body.id, title: `Leak hunt ${fault.kind.length}${fault.component}`, faults: [fault], secondaryPrewired: fault.kind !== 'open-coil' } })
    expect(made.status, made.text).toBe(201)
    expect((await instructor.call(`/api/hunts/${made.body.id}/publish`, { method: 'POST', json: { classIds: [classId] } })).status).toBe(200)
    hunts.push({ fault, id: made.body.id })
  }
})

describe('a student never receives a hunt\'s faults', () => {
  it('walks every student route through a whole attempt at each hunt', async () => {
    await look('GET /api/hunts', student.call('/api/hunts'))
    await look('GET /api/classes', student.call('/api/classes'))
    await look('GET /api/classes/[id]', student.call(`/api/classes/${classId}`))
    for (const { fault, id } of hunts) {
      const tag = fault.kind
      await look(`GET /api/hunts/[id] (${tag})`, student.call(`/api/hunts/${id}`))
      const started = await look(`POST /api/hunts/[id]/attempts (${tag})`, student.call(`/api/hunts/${id}/attempts`, { method: 'POST' }))
      const attempt = JSON.parse(started.text) as { id: number, document: Doc }
      const live = { ...attempt.document, components: attempt.document.components.map(c => (c.kind === 'breaker' ? { ...c, closed: true } : c)) }
      for (const [from, to] of [['T1.X1', 'T1.X4'], ['T3.X4', 'T1.X1'], ['S1.A', 'S1.B'], ['T3.X3', 'T3.X4'], ['T2.H1', 'T2.H2']]) {
        await look(`POST probe ${from}–${to} (${tag})`, student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: live, from, to } }))
      }
      const closed = { ...live, wires: [...live.wires, ['T3.X4', 'T1.X1']] }
      await look(`POST energize (${tag})`, student.call(`/api/attempts/${attempt.id}/energize`, { method: 'POST', json: { document: closed } }))
      await look(`GET /api/attempts/[id] (${tag})`, student.call(`/api/attempts/${attempt.id}`))
      await look(`POST submit (${tag})`, student.call(`/api/attempts/${attempt.id}/submit`, { method: 'POST', json: { diagnosis: [{ component: 'T3', diagnosis: 'coil-open' }, { component: 'S1', diagnosis: 'supply-phasing' }] } }))
      await look(`GET /api/attempts/[id] after submitting (${tag})`, student.call(`/api/attempts/${attempt.id}`))
      // the pages, rendered on the server with their payload
      await look(`page /hunts/[id] (${tag})`, student.call(`/hunts/${id}`, { headers: { accept: 'text/html' } }))
      await look(`page /attempts/[id] (${tag})`, student.call(`/attempts/${attempt.id}`, { headers: { accept: 'text/html' } }))
    }
    for (const path of ['/hunts', '/classes', `/classes/${classId}`]) {
      await look(`page ${path}`, student.call(path, { headers: { accept: 'text/html' } }))
    }
    expect(seen.length).toBeGreaterThan(80)
    const leaks = seen.flatMap(({ where, text }) => FORBIDDEN.filter(f => f.pattern.test(text)).map(f => `${where}: ${f.what}`))
    expect(leaks).toEqual([])
  })

  it('would catch a leak: the same checks find every fault in the author\'s own view', async () => {
    const texts = await Promise.all(hunts.map(h => instructor.call(`/api/hunts/${h.id}`).then(r => r.text)))
    const all = texts.join('\n')
    for (const f of FORBIDDEN.filter(f => f.what !== 'the hidden open-coil part')) expect(f.pattern.test(all), f.what).toBe(true)
  })

  it('gives the readings of the faulted bank, not of the bank as drawn', async () => {
    // the wrong tap of 13.7 % shows on T1's coils: 240 V × 1.137 ≈ 272.9 V
    const tap = hunts.find(h => h.fault.kind === 'wrong-tap')!
    const other = await newPerson('student', databaseURL, 'leak-reader')
    const klass = await instructor.call(`/api/classes/${classId}`)
    await other.call('/api/classes/join', { method: 'POST', json: { code: klass.body.joinCode } })
    const attempt = (await other.call(`/api/hunts/${tap.id}/attempts`, { method: 'POST' })).body
    const live = { ...attempt.document, components: attempt.document.components.map((c: { kind: string }) => (c.kind === 'breaker' ? { ...c, closed: true } : c)) }
    const coil = await other.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: live, from: 'T1.X1', to: 'T1.X4' } })
    expect(coil.body.volts).toBeGreaterThan(265)
    expect(coil.body.volts).toBeLessThan(280)
  })
})
