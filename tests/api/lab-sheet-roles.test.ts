// Every lab-sheet route × every kind of caller → the status it must answer. "owner" is a
// student in the instructor's class who wrote the sheet; "outsider" another student; "rival"
// another instructor. Rows run in order: handing in and review come after the draft rows.
import sharp from 'sharp'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, databaseURL, type ApiInit } from './helpers'
import { as, newPerson, type Person } from './people'

type Caller = 'anonymous' | 'owner' | 'instructor' | 'practitioner' | 'admin' | 'outsider' | 'rival'
const CALLERS: Caller[] = ['anonymous', 'owner', 'instructor', 'practitioner', 'admin', 'outsider', 'rival']
type Expect = [anonymous: number, owner: number, instructor: number, practitioner: number, admin: number, outsider: number, rival: number]

const people = {} as Record<Exclude<Caller, 'anonymous'>, Person>
const ids = { klass: 0, sheet: 0, doomed: 0, photo: 0, doomedPhoto: 0 }
let version = 0
let png: Buffer

function photoForm(): FormData {
  const form = new FormData()
  form.append('photo', new Blob([new Uint8Array(png)], { type: 'image/png' }), 'meter.png')
  return form
}

beforeAll(async () => {
  png = await sharp({ create: { width: 32, height: 24, channels: 3, background: '#445566' } }).png().toBuffer()
  people.owner = await newPerson('student', databaseURL, 'sheetroles-owner')
  people.instructor = await newPerson('instructor', databaseURL, 'sheetroles-teacher')
  people.practitioner = await newPerson('practitioner', databaseURL, 'sheetroles-practitioner')
  people.admin = await newPerson('admin', databaseURL, 'sheetroles-admin')
  people.outsider = await newPerson('student', databaseURL, 'sheetroles-outsider')
  people.rival = await newPerson('instructor', databaseURL, 'sheetroles-rival')
  const klass = (await people.instructor.call('/api/classes', { method: 'POST', json: { name: 'Sheet roles class' } })).body
  ids.klass = klass.id
  await people.owner.call('/api/classes/join', { method: 'POST', json: { code: klass.joinCode } })
  const sheet = (await people.owner.call('/api/lab-sheets', { method: 'POST', json: { starter: 'open-delta-240', classId: ids.klass } })).body
  ids.sheet = sheet.id
  version = sheet.version
  ids.doomed = (await people.owner.call('/api/lab-sheets', { method: 'POST', json: { starter: 'open-delta-240' } })).body.id
  ids.photo = (await people.owner.call(`/api/lab-sheets/${ids.sheet}/photos`, { method: 'POST', body: photoForm() })).body.id
  ids.doomedPhoto = (await people.owner.call(`/api/lab-sheets/${ids.sheet}/photos`, { method: 'POST', body: photoForm() })).body.id
})

interface Row { route: string, request: () => { path: string } & ApiInit, expect: Expect }
const ownerOnly = (ok: number): Expect => [401, ok, 404, 403, 403, 404, 404]

const rows: Row[] = [
  { route: 'GET /api/lab-sheets', request: () => ({ path: '/api/lab-sheets' }), expect: [401, 200, 200, 403, 403, 200, 200] },
  { route: 'GET /api/lab-sheets?classId', request: () => ({ path: `/api/lab-sheets?classId=${ids.klass}` }), expect: [401, 404, 200, 403, 403, 404, 404] },
  { route: 'POST /api/lab-sheets', request: () => ({ path: '/api/lab-sheets', method: 'POST', json: { starter: 'closed-delta-240' } }), expect: [401, 201, 201, 403, 403, 201, 201] },
  { route: 'GET /api/lab-sheets/[id] (draft)', request: () => ({ path: `/api/lab-sheets/${ids.sheet}` }), expect: ownerOnly(200) },
  { route: 'PATCH /api/lab-sheets/[id]', request: () => ({ path: `/api/lab-sheets/${ids.sheet}`, method: 'PATCH', json: { version, notes: 'roles' } }), expect: ownerOnly(200) },
  { route: 'POST /api/lab-sheets/[id]/photos', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/photos`, method: 'POST', body: photoForm() }), expect: ownerOnly(201) },
  { route: 'GET /api/lab-sheets/[id]/photos/[photoId] (draft)', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/photos/${ids.photo}?size=thumb` }), expect: ownerOnly(200) },
  { route: 'DELETE /api/lab-sheets/[id]/photos/[photoId]', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/photos/${ids.doomedPhoto}`, method: 'DELETE' }), expect: ownerOnly(204) },
  { route: 'POST /api/lab-sheets/[id]/review (draft)', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/review`, method: 'POST', json: { verdict: 'accepted' } }), expect: [401, 403, 404, 403, 403, 403, 404] },
  { route: 'DELETE /api/lab-sheets/[id]', request: () => ({ path: `/api/lab-sheets/${ids.doomed}`, method: 'DELETE' }), expect: ownerOnly(204) },
  { route: 'POST /api/lab-sheets/[id]/submit', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/submit`, method: 'POST', json: {} }), expect: ownerOnly(200) },
  { route: 'GET /api/lab-sheets/[id] (handed in)', request: () => ({ path: `/api/lab-sheets/${ids.sheet}` }), expect: [401, 200, 200, 403, 403, 404, 404] },
  { route: 'GET /api/lab-sheets/[id]/photos/[photoId] (handed in)', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/photos/${ids.photo}` }), expect: [401, 200, 200, 403, 403, 404, 404] },
  { route: 'POST /api/lab-sheets/[id]/review', request: () => ({ path: `/api/lab-sheets/${ids.sheet}/review`, method: 'POST', json: { verdict: 'accepted' } }), expect: [401, 403, 200, 403, 403, 403, 404] },
]

const cases = rows.flatMap(row => CALLERS.map((caller, index) => ({ route: row.route, caller, status: row.expect[index]!, row })))

describe('who may call the lab-sheet routes', () => {
  it.each(cases)('$route as $caller → $status', async ({ caller, status, row }) => {
    const { path, ...init } = row.request()
    const call = caller === 'anonymous' ? api : as(people[caller].cookie)
    const response = await call(path, init)
    expect(response.status, response.text).toBe(status)
  })
})
