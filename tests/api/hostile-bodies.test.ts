// fast-check throws generated bodies at every route that takes one: wrong types, huge strings,
// deep nesting, __proto__ keys, SQL and HTML fragments, invalid UTF-8, big numbers, mixed
// with each route's own field names so the checks past the top level are reached too.
// Whatever comes, the answer is never a 5xx; a 4xx is JSON naming the problem.
import fc from 'fast-check'
import { beforeAll, describe, expect, it } from 'vitest'
import { starterBySlug } from '../../shared/starters'
import { api, databaseURL } from './helpers'
import { newPerson, type Person } from './people'

const practice = starterBySlug('closing-check-practice')!.document

let student: Person
let instructor: Person
let admin: Person
const ids = { bank: 0, klass: 0, hunt: 0, attempt: 0, sheet: 0, target: 0 }

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'hostile-student')
  instructor = await newPerson('instructor', databaseURL, 'hostile-teacher')
  admin = await newPerson('admin', databaseURL, 'hostile-admin')
  ids.target = (await newPerson('student', databaseURL, 'hostile-target')).id
  ids.bank = (await instructor.call('/api/banks', { method: 'POST', json: { name: 'hostile', document: practice } })).body.id
  const klass = (await instructor.call('/api/classes', { method: 'POST', json: { name: 'Hostile class' } })).body
  ids.klass = klass.id
  await student.call('/api/classes/join', { method: 'POST', json: { code: klass.joinCode } })
  ids.hunt = (await instructor.call('/api/hunts', { method: 'POST', json: { bankId: ids.bank, title: 'hostile hunt', faults: [{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }] } })).body.id
  await instructor.call(`/api/hunts/${ids.hunt}/publish`, { method: 'POST', json: { classIds: [ids.klass] } })
  ids.attempt = (await student.call(`/api/hunts/${ids.hunt}/attempts`, { method: 'POST' })).body.id
  ids.sheet = (await student.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240' } })).body.id
})

const nasty = fc.constantFrom(
  '\' OR 1=1 --', '"; DROP TABLE users; --', '<script>alert(1)</script>', '<img src=x onerror=alert(1)>',
  '\u0000', '\uFFFF', '𝔘𝔫𝔦𝔠𝔬𝔡𝔢', '../../etc/passwd', '${7*7}', '{{7*7}}', 'T1.X1', 'S1.A', '',
)
const hostileString = fc.oneof(fc.string(), nasty, fc.string({ minLength: 2000, maxLength: 6000 }))
const hostileNumber = fc.oneof(fc.integer(), fc.double(), fc.constantFrom(1e308, -1e308, 2 ** 53 + 1, -0, 0.1, 2_147_483_648))
const { value: hostileValue } = fc.letrec(tie => ({
  value: fc.oneof(
    { depthSize: 'small' },
    hostileString,
    hostileNumber,
    fc.boolean(),
    fc.constant(null),
    fc.array(tie('value'), { maxLength: 4 }),
    fc.dictionary(fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom('__proto__', 'constructor', 'prototype')), tie('value'), { maxKeys: 4 }),
  ),
}))

/** A body as text: an object with the route's own keys (and hostile ones), any JSON at all, or bytes that are not JSON. */
function bodies(keys: string[]) {
  const ownKeys = fc.record(Object.fromEntries(keys.map(k => [k, hostileValue])), { requiredKeys: [] })
  return fc.oneof(
    { weight: 4, arbitrary: ownKeys.map(o => JSON.stringify(o)) },
    { weight: 2, arbitrary: fc.tuple(ownKeys, hostileValue).map(([o, v]) => `{"__proto__": ${JSON.stringify(v) ?? 'null'}, "constructor": {"prototype": {"polluted": true}}, ${JSON.stringify(o).slice(1) || '}'}`) },
    { weight: 1, arbitrary: hostileValue.map(v => JSON.stringify(v) ?? 'null') },
    { weight: 1, arbitrary: fc.integer({ min: 2, max: 3000 }).map(depth => `${'['.repeat(depth)}${']'.repeat(depth)}`) },
    { weight: 1, arbitrary: fc.uint8Array({ minLength: 1, maxLength: 64 }).map(bytes => Buffer.concat([Buffer.from('{"name": "'), Buffer.from(bytes), Buffer.from([0xFF, 0xFE]), Buffer.from('"}')])) },
  )
}

type Who = 'anonymous' | 'student' | 'instructor' | 'admin'
const routes: { method: string, path: () => string, who: Who, keys: string[] }[] = [
  { method: 'POST', path: () => '/api/auth/sign-up', who: 'anonymous', keys: ['name', 'email', 'password', 'role'] },
  { method: 'POST', path: () => '/api/auth/confirm-sign-up', who: 'anonymous', keys: ['token'] },
  { method: 'POST', path: () => '/api/auth/sign-in', who: 'anonymous', keys: ['email', 'password'] },
  { method: 'POST', path: () => '/api/auth/forgot', who: 'anonymous', keys: ['email'] },
  { method: 'POST', path: () => '/api/auth/reset', who: 'anonymous', keys: ['token', 'password'] },
  { method: 'POST', path: () => '/api/solve', who: 'anonymous', keys: ['format', 'version', 'components', 'wires', 'layout'] },
  { method: 'POST', path: () => '/api/invitations/no-such-token-0123456789abcdef/accept', who: 'anonymous', keys: ['name', 'password'] },
  { method: 'PATCH', path: () => '/api/account', who: 'student', keys: ['name', 'currentPassword', 'newPassword'] },
  { method: 'PATCH', path: () => `/api/admin/users/${ids.target}`, who: 'admin', keys: ['role', 'active'] },
  { method: 'POST', path: () => '/api/admin/invitations', who: 'admin', keys: ['email', 'name'] },
  { method: 'POST', path: () => '/api/banks', who: 'instructor', keys: ['name', 'document'] },
  { method: 'PATCH', path: () => `/api/banks/${ids.bank}`, who: 'instructor', keys: ['name', 'document', 'version'] },
  { method: 'POST', path: () => '/api/classes', who: 'instructor', keys: ['name', 'term', 'tolerancePercent'] },
  { method: 'PATCH', path: () => `/api/classes/${ids.klass}`, who: 'instructor', keys: ['name', 'term', 'tolerancePercent'] },
  { method: 'POST', path: () => `/api/classes/${ids.klass}/invitations`, who: 'instructor', keys: ['emails'] },
  { method: 'POST', path: () => '/api/classes/join', who: 'student', keys: ['code', 'token'] },
  { method: 'POST', path: () => '/api/classes/invitation', who: 'student', keys: ['token'] },
  { method: 'POST', path: () => '/api/hunts', who: 'instructor', keys: ['bankId', 'title', 'instructions', 'faults', 'secondaryPrewired', 'dueAt', 'probeBudget', 'feedback'] },
  { method: 'PATCH', path: () => `/api/hunts/${ids.hunt}`, who: 'instructor', keys: ['title', 'instructions', 'faults', 'dueAt', 'probeBudget', 'feedback'] },
  { method: 'POST', path: () => `/api/hunts/${ids.hunt}/publish`, who: 'instructor', keys: ['classIds'] },
  { method: 'POST', path: () => `/api/attempts/${ids.attempt}/probe`, who: 'student', keys: ['document', 'from', 'to'] },
  { method: 'POST', path: () => `/api/attempts/${ids.attempt}/energize`, who: 'student', keys: ['document'] },
  { method: 'POST', path: () => '/api/lab-sheets', who: 'student', keys: ['bankId', 'starter', 'title', 'classId'] },
  { method: 'PATCH', path: () => `/api/lab-sheets/${ids.sheet}`, who: 'student', keys: ['version', 'title', 'measured', 'supplyVolts', 'rescale', 'notes', 'classId'] },
  { method: 'POST', path: () => `/api/lab-sheets/${ids.sheet}/review`, who: 'instructor', keys: ['verdict', 'comment'] },
  { method: 'POST', path: () => `/api/attempts/${ids.attempt}/submit`, who: 'student', keys: ['diagnosis', 'document'] },
  ...['/api/site-checks', '/api/site-checks/plan', '/api/site-checks/pdf'].map(path => ({ method: 'POST', path: () => path, who: 'instructor' as const, keys: ['name', 'supply', 'connection', 'coils', 'units', 'loads'] })),
]

const people = () => ({ student, instructor, admin })

describe('hostile bodies', () => {
  it.each(routes.map(r => ({ ...r, name: `${r.method} ${r.path().replace(/\/0(?=\/|$)/g, '/[id]')}` })))('$name: never a 5xx, a 4xx names the problem', async (route) => {
    const call = route.who === 'anonymous' ? null : people()[route.who]
    const failures: string[] = []
    await fc.assert(fc.asyncProperty(bodies(route.keys), async (body) => {
      const init = { method: route.method, body, headers: { 'content-type': 'application/json' } }
      const r = call ? await call.call(route.path(), init) : await api(route.path(), init)
      if (r.status >= 500 || (r.status >= 400 && (typeof r.body !== 'object' || !r.body.statusMessage))) failures.push(`${r.status} for ${String(body).slice(0, 200)}: ${r.text.slice(0, 300)}`)
      if (r.status === 400 && !(Array.isArray(r.body.data?.errors) && r.body.data.errors.length > 0 && r.body.data.errors.every((e: { path: unknown, message: unknown }) => typeof e.path === 'string' && typeof e.message === 'string'))) {
        failures.push(`400 without named errors for ${String(body).slice(0, 200)}: ${r.text.slice(0, 300)}`)
      }
      if (/\n\s+at .+:\d+:\d+/.test(r.text)) failures.push(`a stack trace for ${String(body).slice(0, 200)}`)
      return failures.length === 0
    }), { numRuns: 25, seed: 20261201 })
    expect(failures).toEqual([])
  })
})

// Every JSON body is checked for depth (32 levels) and width (25 000 keys) as it is read, before
// any schema or the database sees it: 400 naming the place, never a 500 (MariaDB refuses JSON
// nested deeper than 32, and recursive code overflows its stack on 10 000 levels).
const lists = (depth: number) => `${'['.repeat(depth)}${']'.repeat(depth)}`

describe('bodies nested too deep or too wide', () => {
  const call = (route: typeof routes[number], body: string) => {
    const init = { method: route.method, body, headers: { 'content-type': 'application/json' } }
    return route.who === 'anonymous' ? api(route.path(), init) : people()[route.who].call(route.path(), init)
  }

  it.each(routes.map(r => ({ ...r, name: `${r.method} ${r.path().replace(/\/0(?=\/|$)/g, '/[id]')}` })))('$name: 40 deep is 400 naming where it passes 32', async (route) => {
    const key = route.keys[0]!
    const r = await call(route, `{"${key}": ${lists(39)}}`)
    expect(r.status, r.text).toBe(400)
    expect(r.body.data.errors).toEqual([{ path: `${key}${'[0]'.repeat(31)}`, message: 'nested too deep: a body may nest objects and lists 32 levels at most' }])
  })

  it.each([
    ['10 000 lists in a field', `{"document": ${lists(10_000)}}`, `document${'[0]'.repeat(31)}`],
    ['100 000 bare lists', lists(100_000), '[0]'.repeat(32)],
    ['objects 5 000 deep', `${'{"a":'.repeat(5000)}1${'}'.repeat(5000)}`, Array.from({ length: 32 }, () => 'a').join('.')],
  ])('%s: 400, not a stack overflow', async (_, body, path) => {
    const r = await call(routes.find(r => r.path() === '/api/banks')!, body)
    expect(r.status, r.text.slice(0, 300)).toBe(400)
    expect(r.body.data.errors[0].path).toBe(path)
    expect((await api('/api/health')).status).toBe(200)
  })

  it('keeps the widest real bank that fits in 256 KB: 1 300 fuse-and-load pairs with their layout', async () => {
    const components: object[] = [{ id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 }]
    const wires: [string, string][] = []
    const layout: Record<string, { x: number, y: number }> = { S1: { x: 0, y: 0 } }
    for (let i = 0; i < 1300; i++) {
      components.push({ id: `F${i}`, kind: 'fuse', amps: 10 }, { id: `L${i}`, kind: 'load', ohms: 20 })
      wires.push([`S1.${'ABC'[i % 3]}`, `F${i}.a`], [`F${i}.b`, `L${i}.a`], [`L${i}.b`, `S1.${'ABC'[(i + 1) % 3]}`])
      layout[`F${i}`] = { x: i * 40, y: 200 }
      layout[`L${i}`] = { x: i * 40, y: 300 }
    }
    const body = JSON.stringify({ name: 'wide bank', document: { format: 'phaseloom.circuit', version: 1, components, wires, layout } })
    expect(body.length).toBeGreaterThan(230 * 1024)
    expect(body.length).toBeLessThan(256 * 1024)
    const r = await instructor.call('/api/banks', { method: 'POST', body, headers: { 'content-type': 'application/json' } })
    expect(r.status, r.text.slice(0, 300)).toBe(201)
  })

  it('refuses a body of more than 25 000 keys with 400', async () => {
    const wide = `{${Array.from({ length: 25_001 }, (_, i) => `"k${i.toString(36)}":0`).join(',')}}`
    expect(wide.length).toBeLessThan(256 * 1024)
    // signed in: anonymous solves are limited per address, and this is not a test of that
    const r = await student.call('/api/solve', { method: 'POST', body: wide, headers: { 'content-type': 'application/json' } })
    expect(r.status, r.text.slice(0, 300)).toBe(400)
    expect(r.body.data.errors).toEqual([{ path: '(body)', message: 'too many keys: a body may hold 25000 object keys in all' }])
  })
})
