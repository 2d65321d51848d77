// Every accounts and banks route × every kind of caller → the status it must answer.
// Each caller has banks of its own, so a row never depends on what another row did.
import { beforeAll, describe, expect, it } from 'vitest'
import { api, databaseURL, type ApiInit } from './helpers'
import { as, newPerson, PASSWORD, uniqueEmail, type Person } from './people'
import starter from '../../examples/one-unit-series.json'

type Caller = 'anonymous' | 'student' | 'instructor' | 'practitioner' | 'admin'
const CALLERS: Caller[] = ['anonymous', 'student', 'instructor', 'practitioner', 'admin']

interface Banks { main: number, doomed: number, deleted: number }
interface Context { name: string, banks: Banks, sharedToken: string, targetUserId: number }

const people = {} as Record<Exclude<Caller, 'anonymous'>, Person>
const contexts = {} as Record<Caller, Context>
let sharedToken = ''
let targetUserId = 0

async function bank(person: Person, name: string): Promise<number> {
  const created = await person.call('/api/banks', { method: 'POST', json: { name, document: starter } })
  expect(created.status).toBe(201)
  return created.body.id
}

async function banksOf(person: Person): Promise<Banks> {
  const [main, doomed, deleted] = [await bank(person, 'matrix main'), await bank(person, 'matrix doomed'), await bank(person, 'matrix deleted')]
  expect((await person.call(`/api/banks/${deleted}`, { method: 'DELETE' })).status).toBe(204)
  return { main, doomed, deleted }
}

beforeAll(async () => {
  for (const role of ['student', 'instructor', 'practitioner', 'admin'] as const) {
    people[role] = await newPerson(role, databaseURL, `matrix-${role}`)
  }
  const owners = { student: await banksOf(people.student), instructor: await banksOf(people.instructor), practitioner: await banksOf(people.practitioner) }
  const shareMe = await bank(people.practitioner, 'matrix shared')
  sharedToken = (await people.practitioner.call(`/api/banks/${shareMe}/share`, { method: 'POST' })).body.token
  targetUserId = (await newPerson('student', databaseURL, 'matrix-target')).id
  for (const caller of CALLERS) {
    const banks = caller === 'anonymous' || caller === 'admin' ? owners.student : owners[caller]
    contexts[caller] = { name: caller === 'anonymous' ? '' : people[caller].name, banks, sharedToken, targetUserId }
  }
})

type Expect = [anonymous: number, student: number, instructor: number, practitioner: number, admin: number]
interface Row {
  route: string
  request: (c: Context) => { path: string } & ApiInit
  expect: Expect
}

const signedIn = (ok: number): Expect => [401, ok, ok, ok, ok]
const bankRoles = (ok: number): Expect => [401, ok, ok, ok, 403]
const adminOnly = (ok: number): Expect => [401, 403, 403, 403, ok]
const anyone = (status: number): Expect => [status, status, status, status, status]
const badToken = 'no-such-token-0123456789abcdefghij'

const rows: Row[] = [
  { route: 'POST /api/auth/sign-up', request: () => ({ path: '/api/auth/sign-up', method: 'POST', json: { name: 'Matrix Newcomer', email: uniqueEmail('matrix-new'), password: PASSWORD, role: 'student' } }), expect: anyone(202) },
  { route: 'POST /api/auth/confirm-sign-up', request: () => ({ path: '/api/auth/confirm-sign-up', method: 'POST', json: { token: badToken } }), expect: anyone(404) },
  { route: 'POST /api/auth/sign-in', request: () => ({ path: '/api/auth/sign-in', method: 'POST', json: { email: uniqueEmail('matrix-nobody'), password: 'not-the-password' } }), expect: anyone(401) },
  { route: 'POST /api/auth/forgot', request: () => ({ path: '/api/auth/forgot', method: 'POST', json: { email: uniqueEmail('matrix-forgot') } }), expect: anyone(202) },
  { route: 'POST /api/auth/reset', request: () => ({ path: '/api/auth/reset', method: 'POST', json: { token: badToken, password: PASSWORD } }), expect: anyone(400) },
  { route: 'PATCH /api/account', request: c => ({ path: '/api/account', method: 'PATCH', json: { name: c.name || 'Nobody' } }), expect: signedIn(200) },
  { route: 'GET /api/admin/users', request: () => ({ path: '/api/admin/users?q=matrix&role=student&page=1&pageSize=5' }), expect: adminOnly(200) },
  { route: 'PATCH /api/admin/users/[id]', request: c => ({ path: `/api/admin/users/${c.targetUserId}`, method: 'PATCH', json: { active: true } }), expect: adminOnly(200) },
  { route: 'POST /api/admin/invitations', request: () => ({ path: '/api/admin/invitations', method: 'POST', json: { email: uniqueEmail('matrix-invitee') } }), expect: adminOnly(201) },
  { route: 'GET /api/admin/outbox', request: () => ({ path: '/api/admin/outbox' }), expect: adminOnly(200) },
  { route: 'GET /api/invitations/[token]', request: () => ({ path: `/api/invitations/${badToken}` }), expect: anyone(404) },
  { route: 'POST /api/invitations/[token]/accept', request: () => ({ path: `/api/invitations/${badToken}/accept`, method: 'POST', json: {} }), expect: anyone(404) },
  { route: 'GET /api/banks', request: () => ({ path: '/api/banks?q=matrix&sort=name&order=asc&page=1&pageSize=10' }), expect: bankRoles(200) },
  { route: 'GET /api/banks?deleted=1', request: () => ({ path: '/api/banks?deleted=1' }), expect: bankRoles(200) },
  { route: 'POST /api/banks', request: () => ({ path: '/api/banks', method: 'POST', json: { name: 'matrix new', document: starter } }), expect: bankRoles(201) },
  { route: 'GET /api/banks/[id]', request: c => ({ path: `/api/banks/${c.banks.main}` }), expect: bankRoles(200) },
  { route: 'PATCH /api/banks/[id]', request: c => ({ path: `/api/banks/${c.banks.main}`, method: 'PATCH', json: { name: 'matrix renamed', version: 1 } }), expect: bankRoles(200) },
  { route: 'POST /api/banks/[id]/duplicate', request: c => ({ path: `/api/banks/${c.banks.main}/duplicate`, method: 'POST' }), expect: bankRoles(201) },
  { route: 'POST /api/banks/[id]/share', request: c => ({ path: `/api/banks/${c.banks.main}/share`, method: 'POST' }), expect: bankRoles(201) },
  { route: 'DELETE /api/banks/[id]/share', request: c => ({ path: `/api/banks/${c.banks.main}/share`, method: 'DELETE' }), expect: bankRoles(204) },
  { route: 'DELETE /api/banks/[id]', request: c => ({ path: `/api/banks/${c.banks.doomed}`, method: 'DELETE' }), expect: bankRoles(204) },
  { route: 'POST /api/banks/[id]/restore', request: c => ({ path: `/api/banks/${c.banks.deleted}/restore`, method: 'POST' }), expect: bankRoles(200) },
  { route: 'GET /api/shared/[token]', request: c => ({ path: `/api/shared/${c.sharedToken}` }), expect: anyone(200) },
  // last: a sign-out ends the session every row above uses
  { route: 'POST /api/auth/sign-out', request: () => ({ path: '/api/auth/sign-out', method: 'POST' }), expect: anyone(204) },
]

const cases = rows.flatMap(row => CALLERS.map((caller, index) => ({ route: row.route, caller, status: row.expect[index]!, row })))

describe('who may call what', () => {
  it.each(cases)('$route as $caller → $status', async ({ caller, status, row }) => {
    const { path, ...init } = row.request(contexts[caller])
    const call = caller === 'anonymous' ? api : as(people[caller].cookie)
    const response = await call(path, init)
    expect(response.status, response.text).toBe(status)
  })
})
