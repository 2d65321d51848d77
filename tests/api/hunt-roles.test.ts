// Every class, hunt and attempt route × every kind of caller → the status it must answer.
// "member" is a student in the instructor's class, "outsider" a student in another class,
// "rival" another instructor. Rows run in order: the ones that change things come last.
import { beforeAll, describe, expect, it } from 'vitest'
import { starterBySlug } from '../../shared/starters'
import { api, databaseURL, type ApiInit } from './helpers'
import { as, newPerson, type Person } from './people'

type Caller = 'anonymous' | 'member' | 'instructor' | 'practitioner' | 'admin' | 'outsider' | 'rival'
const CALLERS: Caller[] = ['anonymous', 'member', 'instructor', 'practitioner', 'admin', 'outsider', 'rival']
type Expect = [anonymous: number, member: number, instructor: number, practitioner: number, admin: number, outsider: number, rival: number]

const practice = starterBySlug('closing-check-practice')!.document as unknown as { components: { kind: string }[] } & Record<string, unknown>
const people = {} as Record<Exclude<Caller, 'anonymous'>, Person>
const ids = { klass: 0, doomedClass: 0, joinClassCode: '', bank: 0, hunt: 0, doomedHunt: 0, attempt: 0, removable: 0 }
let document: Record<string, unknown> = {}

beforeAll(async () => {
  people.member = await newPerson('student', databaseURL, 'roles-member')
  people.instructor = await newPerson('instructor', databaseURL, 'roles-teacher')
  people.practitioner = await newPerson('practitioner', databaseURL, 'roles-practitioner')
  people.admin = await newPerson('admin', databaseURL, 'roles-admin')
  people.outsider = await newPerson('student', databaseURL, 'roles-outsider')
  people.rival = await newPerson('instructor', databaseURL, 'roles-rival')
  const teacher = people.instructor
  const klass = (await teacher.call('/api/classes', { method: 'POST', json: { name: 'Roles class' } })).body
  ids.klass = klass.id
  ids.doomedClass = (await teacher.call('/api/classes', { method: 'POST', json: { name: 'Roles doomed' } })).body.id
  ids.joinClassCode = (await teacher.call('/api/classes', { method: 'POST', json: { name: 'Roles open door' } })).body.joinCode
  await people.member.call('/api/classes/join', { method: 'POST', json: { code: klass.joinCode } })
  const removable = await newPerson('student', databaseURL, 'roles-removable')
  await removable.call('/api/classes/join', { method: 'POST', json: { code: klass.joinCode } })
  ids.removable = removable.id
  const rivalClass = (await people.rival.call('/api/classes', { method: 'POST', json: { name: 'Rival class' } })).body
  await people.outsider.call('/api/classes/join', { method: 'POST', json: { code: rivalClass.joinCode } })
  ids.bank = (await teacher.call('/api/banks', { method: 'POST', json: { name: 'roles bank', document: practice } })).body.id
  const hunt = (await teacher.call('/api/hunts', { method: 'POST', json: { bankId: ids.bank, title: 'Roles hunt', faults: [{ kind: 'secondary-reversed', component: 'T3' }] } })).body
  ids.hunt = hunt.id
  ids.doomedHunt = (await teacher.call('/api/hunts', { method: 'POST', json: { bankId: ids.bank, title: 'Roles doomed hunt', faults: [{ kind: 'secondary-reversed', component: 'T3' }] } })).body.id
  await teacher.call(`/api/hunts/${ids.hunt}/publish`, { method: 'POST', json: { classIds: [ids.klass] } })
  const attempt = (await people.member.call(`/api/hunts/${ids.hunt}/attempts`, { method: 'POST' })).body
  ids.attempt = attempt.id
  document = attempt.document
})

interface Row {
  route: string
  request: () => { path: string } & ApiInit
  expect: Expect
}

const members = (ok: number): Expect => [401, ok, ok, 403, 403, ok, ok]
const teacherOnly = (ok: number): Expect => [401, 403, ok, 403, 403, 403, 404]
const studentOfClass = (ok: number): Expect => [401, ok, 404, 403, 403, 404, 404]

const rows: Row[] = [
  { route: 'GET /api/classes', request: () => ({ path: '/api/classes' }), expect: members(200) },
  { route: 'POST /api/classes', request: () => ({ path: '/api/classes', method: 'POST', json: { name: 'made in the matrix' } }), expect: [401, 403, 201, 403, 403, 403, 201] },
  { route: 'GET /api/classes/[id]', request: () => ({ path: `/api/classes/${ids.klass}` }), expect: [401, 200, 200, 403, 403, 404, 404] },
  { route: 'PATCH /api/classes/[id]', request: () => ({ path: `/api/classes/${ids.klass}`, method: 'PATCH', json: { term: 'Matrix term' } }), expect: teacherOnly(200) },
  { route: 'POST /api/classes/[id]/invitations', request: () => ({ path: `/api/classes/${ids.klass}/invitations`, method: 'POST', json: { emails: ['matrix-invitee@phaseloom.test'] } }), expect: teacherOnly(201) },
  { route: 'POST /api/classes/join', request: () => ({ path: '/api/classes/join', method: 'POST', json: { code: ids.joinClassCode } }), expect: [401, 200, 409, 403, 403, 200, 200] },
  { route: 'GET /api/hunts', request: () => ({ path: '/api/hunts' }), expect: members(200) },
  { route: 'POST /api/hunts', request: () => ({ path: '/api/hunts', method: 'POST', json: { bankId: ids.bank, title: 'matrix hunt', faults: [{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }] } }), expect: [401, 403, 201, 403, 403, 403, 404] },
  { route: 'GET /api/hunts/[id]', request: () => ({ path: `/api/hunts/${ids.hunt}` }), expect: [401, 200, 200, 403, 403, 404, 404] },
  { route: 'PATCH /api/hunts/[id]', request: () => ({ path: `/api/hunts/${ids.hunt}`, method: 'PATCH', json: { instructions: 'Matrix instructions' } }), expect: teacherOnly(200) },
  { route: 'POST /api/hunts/[id]/publish', request: () => ({ path: `/api/hunts/${ids.hunt}/publish`, method: 'POST', json: { classIds: [ids.klass] } }), expect: teacherOnly(200) },
  { route: 'GET /api/hunts/[id]/attempts', request: () => ({ path: `/api/hunts/${ids.hunt}/attempts` }), expect: teacherOnly(200) },
  { route: 'POST /api/hunts/[id]/attempts', request: () => ({ path: `/api/hunts/${ids.hunt}/attempts`, method: 'POST' }), expect: studentOfClass(200) },
  { route: 'GET /api/attempts/[id]', request: () => ({ path: `/api/attempts/${ids.attempt}` }), expect: [401, 200, 200, 403, 403, 404, 404] },
  { route: 'POST /api/attempts/[id]/probe', request: () => ({ path: `/api/attempts/${ids.attempt}/probe`, method: 'POST', json: { document, from: 'T1.X1', to: 'T1.X4' } }), expect: studentOfClass(200) },
  { route: 'POST /api/attempts/[id]/energize', request: () => ({ path: `/api/attempts/${ids.attempt}/energize`, method: 'POST', json: { document } }), expect: studentOfClass(200) },
  { route: 'POST /api/attempts/[id]/submit', request: () => ({ path: `/api/attempts/${ids.attempt}/submit`, method: 'POST', json: { diagnosis: [{ component: 'T3', diagnosis: 'polarity-reversed' }] } }), expect: studentOfClass(200) },
  { route: 'DELETE /api/classes/[id]/members/[userId]', request: () => ({ path: `/api/classes/${ids.klass}/members/${ids.removable}`, method: 'DELETE' }), expect: teacherOnly(204) },
  { route: 'DELETE /api/hunts/[id]', request: () => ({ path: `/api/hunts/${ids.doomedHunt}`, method: 'DELETE' }), expect: teacherOnly(204) },
  { route: 'DELETE /api/classes/[id]', request: () => ({ path: `/api/classes/${ids.doomedClass}`, method: 'DELETE' }), expect: teacherOnly(204) },
]

const cases = rows.flatMap(row => CALLERS.map((caller, index) => ({ route: row.route, caller, status: row.expect[index]!, row })))

describe('who may call the class, hunt and attempt routes', () => {
  it.each(cases)('$route as $caller → $status', async ({ caller, status, row }) => {
    const { path, ...init } = row.request()
    const call = caller === 'anonymous' ? api : as(people[caller].cookie)
    const response = await call(path, init)
    expect(response.status, response.text).toBe(status)
  })

  it('a body is not read before the caller is known: anonymous malformed JSON is 401, not 400', async () => {
    const response = await api(`/api/attempts/${ids.attempt}/probe`, { method: 'POST', body: '{not json', headers: { 'content-type': 'application/json' } })
    expect(response.status).toBe(401)
  })
})
