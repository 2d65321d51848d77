import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq, sql } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { banks, users } from '../../server/db/schema'
import { migrateDatabase } from '../../scripts/migrate.mjs'
import { DEMO_PASSWORD, DEMO_PEOPLE, verifyDemoPassword } from '../../scripts/seed.mjs'
import { databaseURL } from './helpers'

const journal = JSON.parse(readFileSync(new URL('../../drizzle/meta/_journal.json', import.meta.url), 'utf8'))

// A bank document with the awkward parts of JSON: nesting, unicode, decimals, null, booleans.
const bankDocument = {
  format: 'phaseloom.circuit',
  version: 1,
  name: 'Round trip: wye–delta, 208 V ∠ −30°',
  components: [
    { id: 'S1', kind: 'supply', connection: 'wye', lineVolts: 208, hz: 60, rotation: 'ABC', sourceOhms: { r: 0.02, x: 0.05 } },
    { id: 'T1', kind: 'transformer', kva: 37.5, primaryVolts: 120, secondaryVolts: [120, 120], impedancePercent: 2.7 },
    { id: 'F1', kind: 'fuse', amps: 15, blown: false },
  ],
  wires: [['S1.A', 'T1.H1'], ['S1.N', 'T1.H2']],
  layout: { T1: { x: 320.5, y: -80 } },
  notes: null,
}

const db = createDB(databaseURL, { connectionLimit: 2 })
const email = `round-trip-${process.pid}-${Date.now()}@phaseloom.test`
let ownerId = 0

beforeAll(async () => {
  // test.mjs migrated already; migrating again must be a no-op
  await migrateDatabase(databaseURL)
})

afterAll(async () => {
  if (ownerId) {
    await db.delete(banks).where(eq(banks.ownerId, ownerId))
    await db.delete(users).where(eq(users.id, ownerId))
  }
  await db.$client.end()
})

describe('database', () => {
  it('has applied every committed migration exactly once', async () => {
    const [rows] = await db.$client.query('SELECT hash FROM __drizzle_migrations') as unknown as [unknown[]]
    expect(rows).toHaveLength(journal.entries.length)
  })

  it('stores a bank document and reads it back equal', async () => {
    const [owner] = await db.insert(users)
      .values({ email, name: 'Round Trip', role: 'student', passwordHash: 'not-a-real-hash' })
      .$returningId()
    ownerId = owner!.id
    const [inserted] = await db.insert(banks)
      .values({ ownerId, name: bankDocument.name, document: bankDocument })
      .$returningId()

    const [bank] = await db.select().from(banks).where(eq(banks.id, inserted!.id))
    expect(bank!.document).toEqual(bankDocument)
    expect(bank!.version).toBe(1)
    expect(bank!.deletedAt).toBeNull()
    expect(bank!.createdAt).toBeInstanceOf(Date)
    expect(Number.isNaN(bank!.createdAt.getTime())).toBe(false)

    // MariaDB keeps JSON as LONGTEXT; depending on the column metadata the driver sees,
    // it hands back text or parsed JSON. The column type reads both the same.
    const [raw] = await db.$client.query('SELECT document, CAST(document AS CHAR) AS text FROM banks WHERE id = ?', [inserted!.id]) as unknown as [{ document: unknown, text: string }[]]
    expect(banks.document.mapFromDriverValue(raw[0]!.text as never)).toEqual(bankDocument)
    expect(banks.document.mapFromDriverValue(raw[0]!.document as never)).toEqual(bankDocument)
  })

  it('keeps datetimes in UTC with millisecond precision', async () => {
    const when = new Date('2026-03-04T05:06:07.089Z')
    const [inserted] = await db.insert(banks)
      .values({ ownerId, name: 'deleted bank', document: bankDocument, deletedAt: when })
      .$returningId()
    const [bank] = await db.select().from(banks).where(eq(banks.id, inserted!.id))
    expect(bank!.deletedAt?.toISOString()).toBe(when.toISOString())
    const [stored] = await db.select({ text: sql<string>`DATE_FORMAT(${banks.deletedAt}, '%Y-%m-%d %H:%i:%s.%f')` })
      .from(banks).where(eq(banks.id, inserted!.id))
    expect(stored!.text).toBe('2026-03-04 05:06:07.089000')
  })

  it('refuses a second account with the same e-mail', async () => {
    await expect(db.insert(users).values({ email, name: 'Again', passwordHash: 'x' }))
      .rejects.toMatchObject({ cause: { code: 'ER_DUP_ENTRY' } })
  })

  it('holds the seeded demo people, each with a working password hash', async () => {
    const rows = await db.select().from(users)
    for (const person of DEMO_PEOPLE) {
      const row = rows.find(user => user.email === person.email)
      expect(row, person.email).toBeDefined()
      expect(row!.role).toBe(person.role)
      expect(row!.active).toBe(true)
      expect(row!.sessionVersion).toBe(0)
      expect(await verifyDemoPassword(row!.passwordHash, DEMO_PASSWORD)).toBe(true)
    }
  })
})
