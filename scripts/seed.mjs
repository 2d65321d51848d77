// The demo scenario: Riverbend Electrical Training Centre, its staff and learners, and a
// few of their banks. Development only. Idempotent: people are matched by e-mail and
// banks by owner and name, so running it twice changes nothing.
//   node scripts/seed.mjs               (uses NUXT_DATABASE_URL)
import { resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import mysql from 'mysql2/promise'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

export const DEMO_PASSWORD = 'phaseloom-demo'

export const DEMO_PEOPLE = [
  { email: 'admin@phaseloom.test', name: 'Marisol Okafor', role: 'admin', about: 'runs the centre\'s systems' },
  { email: 'instructor@phaseloom.test', name: 'Desmond Varga', role: 'instructor', about: 'leads the transformer lab' },
  { email: 'student@phaseloom.test', name: 'Priya Lindqvist', role: 'student', about: 'third-year apprentice' },
  { email: 'student2@phaseloom.test', name: 'Tomasz Abara', role: 'student', about: 'second-year apprentice' },
  { email: 'practitioner@phaseloom.test', name: 'Hollis Baptiste', role: 'practitioner', about: 'field electrician' },
]

const supply = { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, hz: 60 }

/** Banks the demo people have saved (circuit documents, format version 1). */
export const DEMO_BANKS = [
  {
    owner: 'student@phaseloom.test',
    document: {
      format: 'phaseloom.circuit',
      version: 1,
      name: 'Lab bay 2: one unit, coils in series for 240 V',
      components: [
        supply,
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] },
        { id: 'M1', kind: 'voltmeter' },
      ],
      wires: [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.X2', 'T1.X3'], ['M1.a', 'T1.X1'], ['M1.b', 'T1.X4']],
      layout: { S1: { x: 40, y: 80 }, T1: { x: 320, y: 80 }, M1: { x: 560, y: 80 } },
    },
  },
  {
    owner: 'practitioner@phaseloom.test',
    document: {
      format: 'phaseloom.circuit',
      version: 1,
      name: 'Mill Road pump house: open delta, 240 V secondary',
      components: [
        supply,
        { id: 'T1', kind: 'transformer', kva: 25, primaryVolts: 480, secondaryVolts: [120, 120] },
        { id: 'T2', kind: 'transformer', kva: 25, primaryVolts: 480, secondaryVolts: [120, 120] },
        { id: 'M1', kind: 'voltmeter' },
      ],
      wires: [
        ['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['S1.B', 'T2.H1'], ['S1.C', 'T2.H2'],
        ['T1.X2', 'T1.X3'], ['T2.X2', 'T2.X3'], ['T1.X4', 'T2.X1'],
        ['M1.a', 'T1.X1'], ['M1.b', 'T2.X4'],
      ],
      layout: {},
    },
  },
]

let hasher
/**
 * Hash a password exactly as nuxt-auth-utils' `hashPassword` does: @adonisjs/hash's
 * scrypt driver with its default options (the app sets no `hash.scrypt` options).
 */
export function hashDemoPassword(password) {
  hasher ??= new Hash(new Scrypt({}))
  return hasher.make(password)
}

export function verifyDemoPassword(hash, password) {
  hasher ??= new Hash(new Scrypt({}))
  return hasher.verify(hash, password)
}

/** True when no one has an account yet. */
export async function databaseIsEmpty(url) {
  const connection = await mysql.createConnection({ uri: url, timezone: 'Z' })
  try {
    const [rows] = await connection.query('SELECT COUNT(*) AS n FROM users')
    return Number(rows[0].n) === 0
  }
  finally {
    await connection.end()
  }
}

/** Add the demo people and banks that are not there yet. */
export async function seedDemo(url) {
  const connection = await mysql.createConnection({ uri: url, timezone: 'Z' })
  try {
    const passwordHash = await hashDemoPassword(DEMO_PASSWORD)
    for (const person of DEMO_PEOPLE) {
      await connection.execute(
        'INSERT IGNORE INTO users (email, name, role, password_hash) VALUES (?, ?, ?, ?)',
        [person.email, person.name, person.role, passwordHash],
      )
    }
    for (const bank of DEMO_BANKS) {
      const [owners] = await connection.execute('SELECT id FROM users WHERE email = ?', [bank.owner])
      const ownerId = owners[0].id
      const [existing] = await connection.execute(
        'SELECT id FROM banks WHERE owner_id = ? AND name = ? AND deleted_at IS NULL',
        [ownerId, bank.document.name],
      )
      if (existing.length > 0) continue
      await connection.execute(
        'INSERT INTO banks (owner_id, name, document) VALUES (?, ?, ?)',
        [ownerId, bank.document.name, JSON.stringify(bank.document)],
      )
    }
  }
  finally {
    await connection.end()
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const url = process.env.NUXT_DATABASE_URL
  if (!url) {
    console.error('Set NUXT_DATABASE_URL first.')
    process.exit(1)
  }
  await seedDemo(url)
  console.log('Demo scenario seeded.')
}
