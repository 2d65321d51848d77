// Lab sheets keep their test points and count: worked out once when the sheet is made, then
// every read and list uses the stored values and solves nothing. Changing the stored values
// behind the app's back shows it (what comes back is what is stored, not a new solve); a
// sheet made before points were stored has them worked out on its first read, once.
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { labPoints } from '../../shared/lab-sheets/points'
import { starterBySlug } from '../../shared/starters'
import { databaseURL } from './helpers'
import { newPerson, type Person } from './people'

let student: Person
let connection: mysql.Connection

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'sheet-points')
  connection = await mysql.createConnection({ uri: databaseURL })
})

afterAll(async () => {
  await connection?.end()
})

async function stored(id: number) {
  const [[row]] = await connection.query('SELECT points, point_count AS pointCount FROM lab_sheets WHERE id = ?', [id]) as unknown as [[{ points: unknown, pointCount: number | null }]]
  return { points: typeof row.points === 'string' ? JSON.parse(row.points) : row.points, pointCount: row.pointCount }
}

const readPoints = async (id: number) => {
  const r = await student.call(`/api/lab-sheets/${id}`)
  expect(r.status).toBe(200)
  return r.body.comparison.rows.map((row: { point: unknown }) => row.point)
}
const listed = async (id: number) => (await student.call('/api/lab-sheets')).body.find((s: { id: number }) => s.id === id)

describe('stored lab-sheet points', () => {
  it('are the engine\'s points, stored when the sheet is made, and read and listed from the store', async () => {
    const expected = labPoints(starterBySlug('closed-delta-240')!.document as unknown as Record<string, unknown>)
    expect(expected.length).toBeGreaterThan(3)
    const made = await student.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240', title: 'Stored points' } })
    expect(made.status).toBe(201)
    const id = made.body.id as number
    expect(await stored(id)).toEqual({ points: expected, pointCount: expected.length })
    expect(await readPoints(id)).toEqual(expected)
    expect((await listed(id)).points).toBe(expected.length)

    // what the read and the list give is what is stored, not a new solve
    const changed = expected.map((p, i) => (i === 0 ? { ...p, expectedVolts: 12345 } : p))
    await connection.query('UPDATE lab_sheets SET points = ?, point_count = ? WHERE id = ?', [JSON.stringify(changed), 99, id])
    expect((await readPoints(id))[0].expectedVolts).toBe(12345)
    expect((await listed(id)).points).toBe(99)
  })

  it('a sheet made before points were stored gets them on its first read, once, the same as the engine\'s', async () => {
    const expected = labPoints(starterBySlug('closed-delta-240')!.document as unknown as Record<string, unknown>)
    const made = await student.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240', title: 'Older sheet' } })
    const id = made.body.id as number
    await connection.query('UPDATE lab_sheets SET points = NULL, point_count = NULL WHERE id = ?', [id])
    expect((await listed(id)).points).toBe(expected.length)
    expect(await stored(id)).toEqual({ points: expected, pointCount: expected.length })

    await connection.query('UPDATE lab_sheets SET points = NULL, point_count = NULL WHERE id = ?', [id])
    expect(await readPoints(id)).toEqual(expected)
    expect(await stored(id)).toEqual({ points: expected, pointCount: expected.length })
    const again = await student.call(`/api/lab-sheets/${id}`, { method: 'PATCH', json: { version: made.body.version, measured: { [expected[0]!.id]: 480 } } })
    expect(again.status).toBe(200)
    expect((await listed(id)).taken).toBe(1)
  })
})
