// An attempt's guards: the probe budget checked in the UPDATE itself (20 parallel probes on a
// budget of 3 use exactly 3), a document whose parts are not the hunt's answers 400 naming the
// part (never 500), and a probe of a terminal the hunt's bank does not have answers 400 and
// is not counted.
import mysql from 'mysql2/promise'
import { beforeAll, describe, expect, it } from 'vitest'
import { starterBySlug } from '../../shared/starters'
import { databaseURL } from './helpers'
import { newPerson, type Person } from './people'

type Doc = { components: Record<string, unknown>[], wires: [string, string][] }
const practice = starterBySlug('closing-check-practice')!.document as unknown as Doc

let student: Person
let instructor: Person
let classId = 0
let bankId = 0

async function startHunt(title: string, probeBudget: number | null) {
  const hunt = await instructor.call('/api/hunts', { method: 'POST', json: { bankId, title, faults: [{ kind: 'secondary-reversed', component: 'T2' }], secondaryPrewired: true, probeBudget } })
  expect(hunt.status).toBe(201)
  expect((await instructor.call(`/api/hunts/${hunt.body.id}/publish`, { method: 'POST', json: { classIds: [classId] } })).status).toBe(200)
  const attempt = await student.call(`/api/hunts/${hunt.body.id}/attempts`, { method: 'POST' })
  expect([200, 201]).toContain(attempt.status)
  return { id: attempt.body.id as number, document: attempt.body.document as Doc }
}

async function recorded(attemptId: number) {
  const connection = await mysql.createConnection({ uri: databaseURL })
  try {
    const [[row]] = await connection.query('SELECT probes_used AS used FROM attempts WHERE id = ?', [attemptId]) as unknown as [[{ used: number }]]
    const [[count]] = await connection.query('SELECT COUNT(*) AS n FROM attempt_probes WHERE attempt_id = ?', [attemptId]) as unknown as [[{ n: number }]]
    return { used: Number(row.used), rows: Number(count.n) }
  }
  finally {
    await connection.end()
  }
}

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'guards-student')
  instructor = await newPerson('instructor', databaseURL, 'guards-teacher')
  bankId = (await instructor.call('/api/banks', { method: 'POST', json: { name: 'Guards bank', document: practice } })).body.id
  const klass = (await instructor.call('/api/classes', { method: 'POST', json: { name: 'Guards class' } })).body
  classId = klass.id
  expect((await student.call('/api/classes/join', { method: 'POST', json: { code: klass.joinCode } })).status).toBe(200)
})

describe('attempt guards', () => {
  it('20 parallel probes on a budget of 3 use exactly 3', async () => {
    const attempt = await startHunt('Budget race', 3)
    const answers = await Promise.all(Array.from({ length: 20 }, () =>
      student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: 'T1.X1', to: 'T1.X4' } })))
    const statuses = answers.map(a => a.status)
    expect(statuses.filter(s => s === 200)).toHaveLength(3)
    expect(statuses.filter(s => s !== 200).every(s => s === 409)).toBe(true)
    expect(await recorded(attempt.id)).toEqual({ used: 3, rows: 3 })
  })

  it('400 naming the part for a document whose part differs from the hunt\'s bank; never 500', async () => {
    const attempt = await startHunt('Changed parts', 10)
    const unit = attempt.document.components.findIndex(c => c.id === 'T1')
    const bigger = { ...attempt.document, components: attempt.document.components.map((c, i) => (i === unit ? { ...c, kva: Number(c.kva ?? 10) * 2 } : c)) }
    const energize = await student.call(`/api/attempts/${attempt.id}/energize`, { method: 'POST', json: { document: bigger } })
    expect(energize.status).toBe(400)
    expect(energize.body.data.errors).toEqual([expect.objectContaining({ path: `document.components[${unit}]`, message: expect.stringContaining('T1') })])
    expect(energize.body.data.errors[0].message).toContain('kva')

    // the supply made a wye with its neutral wired: a different part, not a 500
    const supply = attempt.document.components.findIndex(c => c.kind === 'supply')
    const supplyId = attempt.document.components[supply]!.id as string
    const other = attempt.document.components.find(c => c.kind === 'transformer')!.id as string
    const wye = {
      ...attempt.document,
      components: attempt.document.components.map((c, i) => (i === supply ? { ...c, connection: 'wye' } : c)),
      wires: [...attempt.document.wires, [`${supplyId}.N`, `${other}.H2`]],
    }
    const probe = await student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: wye, from: `${supplyId}.N`, to: `${supplyId}.A` } })
    expect(probe.status).toBe(400)
    expect(probe.body.data.errors.map((e: { path: string }) => e.path)).toContain(`document.components[${supply}]`)
    expect(await recorded(attempt.id)).toEqual({ used: 0, rows: 0 })

    // the wiring, the breaker handle and the fuses are the student's: those are accepted
    const live = { ...attempt.document, components: attempt.document.components.map(c => (c.kind === 'breaker' ? { ...c, closed: true } : c)) }
    expect((await student.call(`/api/attempts/${attempt.id}/energize`, { method: 'POST', json: { document: live } })).status).toBe(200)
  })

  it('a probe of a terminal the hunt\'s bank does not have: 400, not counted', async () => {
    const attempt = await startHunt('Missing terminal', 10)
    const supplyId = attempt.document.components.find(c => c.kind === 'supply')!.id as string
    const r = await student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: `${supplyId}.N`, to: 'T1.X1' } })
    expect(r.status).toBe(400)
    expect(r.body.data.errors).toEqual([expect.objectContaining({ path: 'from', message: expect.stringContaining(`${supplyId}.N`) })])
    expect(await recorded(attempt.id)).toEqual({ used: 0, rows: 0 })
    const good = await student.call(`/api/attempts/${attempt.id}/probe`, { method: 'POST', json: { document: attempt.document, from: 'T1.X1', to: 'T1.X4' } })
    expect(good.status).toBe(200)
    expect(await recorded(attempt.id)).toEqual({ used: 1, rows: 1 })
  })
})
