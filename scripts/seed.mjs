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

const unit = { kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }

/** The instructor's lab bank behind the demo hunt: a delta–delta with its last corner open. */
export const DEMO_HUNT_BANK = {
  format: 'phaseloom.circuit',
  version: 1,
  name: 'Bay 4: delta–delta 480 V to 240 V, last corner open',
  components: [
    supply,
    { id: 'CB1', kind: 'breaker', poles: 3, amps: 60, closed: false },
    { id: 'F1', kind: 'fuse', amps: 50 }, { id: 'F2', kind: 'fuse', amps: 50 }, { id: 'F3', kind: 'fuse', amps: 50 },
    { id: 'T1', ...unit }, { id: 'T2', ...unit }, { id: 'T3', ...unit },
    { id: 'OUT', kind: 'output' },
  ],
  wires: [
    ['S1.A', 'CB1.L1'], ['S1.B', 'CB1.L2'], ['S1.C', 'CB1.L3'],
    ['CB1.T1', 'F1.a'], ['CB1.T2', 'F2.a'], ['CB1.T3', 'F3.a'],
    ['F1.b', 'T1.H1'], ['F2.b', 'T1.H2'], ['F2.b', 'T2.H1'], ['F3.b', 'T2.H2'], ['F3.b', 'T3.H1'], ['F1.b', 'T3.H2'],
    ['T1.X2', 'T1.X3'], ['T2.X2', 'T2.X3'], ['T3.X2', 'T3.X3'],
    ['T1.X4', 'T2.X1'], ['T2.X4', 'T3.X1'],
    ['OUT.a', 'T1.X1'], ['OUT.b', 'T2.X1'], ['OUT.c', 'T3.X1'],
  ],
  layout: {
    S1: { x: 0, y: 0 }, CB1: { x: 280, y: 0 }, F1: { x: 560, y: 0 }, F2: { x: 560, y: 120 }, F3: { x: 560, y: 240 },
    T1: { x: 0, y: 390 }, T2: { x: 280, y: 390 }, T3: { x: 560, y: 390 }, OUT: { x: 280, y: 650 },
  },
}

/** The demo class (both demo students in it) and the fault hunt published to it. */
export const DEMO_CLASS = { name: 'Transformer Lab A', term: 'Winter 2027', joinCode: 'RVBLAB27', members: ['student@phaseloom.test', 'student2@phaseloom.test'] }
export const DEMO_HUNT = {
  title: 'Bay 4: one unit is not what it seems',
  instructions: 'The bank is wired as a delta–delta with the last corner (T3.X4 to T1.X1) left open. Before you close that corner, take the closing check. If it is not near 0 V, find which unit is at fault with the meter and name it. Do not close the corner onto a fault.',
  faults: [{ kind: 'secondary-reversed', component: 'T2' }],
}

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
    await seedClassAndHunt(connection)
  }
  finally {
    await connection.end()
  }
}

async function idOf(connection, email) {
  const [rows] = await connection.execute('SELECT id FROM users WHERE email = ?', [email])
  return rows[0].id
}

async function seedClassAndHunt(connection) {
  const instructorId = await idOf(connection, 'instructor@phaseloom.test')
  await connection.execute(
    'INSERT IGNORE INTO classes (instructor_id, name, term, join_code) VALUES (?, ?, ?, ?)',
    [instructorId, DEMO_CLASS.name, DEMO_CLASS.term, DEMO_CLASS.joinCode],
  )
  const [[klass]] = await connection.execute('SELECT id FROM classes WHERE join_code = ?', [DEMO_CLASS.joinCode])
  for (const email of DEMO_CLASS.members) {
    await connection.execute('INSERT IGNORE INTO class_members (class_id, user_id) VALUES (?, ?)', [klass.id, await idOf(connection, email)])
  }
  const [bankRows] = await connection.execute('SELECT id FROM banks WHERE owner_id = ? AND name = ? AND deleted_at IS NULL', [instructorId, DEMO_HUNT_BANK.name])
  if (bankRows.length === 0) {
    await connection.execute('INSERT INTO banks (owner_id, name, document) VALUES (?, ?, ?)', [instructorId, DEMO_HUNT_BANK.name, JSON.stringify(DEMO_HUNT_BANK)])
  }
  const [huntRows] = await connection.execute('SELECT id FROM hunts WHERE author_id = ? AND title = ? AND deleted_at IS NULL', [instructorId, DEMO_HUNT.title])
  let huntId = huntRows[0]?.id
  if (!huntId) {
    const [inserted] = await connection.execute(
      'INSERT INTO hunts (author_id, title, instructions, document, faults, secondary_prewired, probe_budget, feedback, published_at) VALUES (?, ?, ?, ?, ?, TRUE, 40, \'on-submit\', CURRENT_TIMESTAMP(3))',
      [instructorId, DEMO_HUNT.title, DEMO_HUNT.instructions, JSON.stringify(DEMO_HUNT_BANK), JSON.stringify(DEMO_HUNT.faults)],
    )
    huntId = inserted.insertId
  }
  await connection.execute('INSERT IGNORE INTO hunt_classes (hunt_id, class_id) VALUES (?, ?)', [huntId, klass.id])
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
