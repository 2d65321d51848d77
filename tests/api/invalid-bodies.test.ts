// Bodies and queries that are wrong in every usual way: 400 (or 413) naming the field,
// never a 500 and never a stack trace.
import { beforeAll, describe, expect, it } from 'vitest'
import { api, databaseURL, type ApiInit } from './helpers'
import { newPerson, PASSWORD, type Person } from './people'
import starter from '../../examples/one-unit-series.json'

let student: Person
let admin: Person
let bankId = 0

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'invalid-student')
  admin = await newPerson('admin', databaseURL, 'invalid-admin')
  bankId = (await student.call('/api/banks', { method: 'POST', json: { name: 'Invalid bodies', document: starter } })).body.id
})

const raw = (body: string): ApiInit => ({ method: 'POST', body, headers: { 'content-type': 'application/json' } })
const huge = { name: 'Too big', document: { ...starter, layout: Object.fromEntries(Array.from({ length: 12000 }, (_, i) => [`N${i}`, { x: i, y: i }])) } }

interface Case {
  what: string
  who: 'anonymous' | 'student' | 'admin'
  path: string | (() => string)
  init: ApiInit
  status: 400 | 413
  field: string
}

const cases: Case[] = [
  { what: 'sign-up without a password', who: 'anonymous', path: '/api/auth/sign-up', init: { method: 'POST', json: { name: 'A', email: 'a@phaseloom.test', role: 'student' } }, status: 400, field: 'password' },
  { what: 'sign-up with a short password', who: 'anonymous', path: '/api/auth/sign-up', init: { method: 'POST', json: { name: 'A', email: 'a@phaseloom.test', password: 'short', role: 'student' } }, status: 400, field: 'password' },
  { what: 'sign-up as an admin', who: 'anonymous', path: '/api/auth/sign-up', init: { method: 'POST', json: { name: 'A', email: 'a@phaseloom.test', password: PASSWORD, role: 'admin' } }, status: 400, field: 'role' },
  { what: 'sign-up with a number for e-mail', who: 'anonymous', path: '/api/auth/sign-up', init: { method: 'POST', json: { name: 'A', email: 42, password: PASSWORD, role: 'student' } }, status: 400, field: 'email' },
  { what: 'sign-in with malformed JSON', who: 'anonymous', path: '/api/auth/sign-in', init: raw('{"email": "a@phaseloom.test", "password": '), status: 400, field: '(body)' },
  { what: 'sign-in with no body', who: 'anonymous', path: '/api/auth/sign-in', init: raw(''), status: 400, field: '(body)' },
  { what: 'sign-in with an array', who: 'anonymous', path: '/api/auth/sign-in', init: raw('[1, 2]'), status: 400, field: '(body)' },
  { what: 'sign-in with a bad e-mail', who: 'anonymous', path: '/api/auth/sign-in', init: { method: 'POST', json: { email: 'not-an-address', password: 'x' } }, status: 400, field: 'email' },
  { what: 'forgot with an object for e-mail', who: 'anonymous', path: '/api/auth/forgot', init: { method: 'POST', json: { email: { $ne: '' } } }, status: 400, field: 'email' },
  { what: 'reset with a short password', who: 'anonymous', path: '/api/auth/reset', init: { method: 'POST', json: { token: 'x'.repeat(43), password: 'short' } }, status: 400, field: 'password' },
  { what: 'reset with an oversize body', who: 'anonymous', path: '/api/auth/reset', init: raw(JSON.stringify({ token: 'x'.repeat(300 * 1024), password: PASSWORD })), status: 413, field: '(body)' },
  { what: 'a new password without the current one', who: 'student', path: '/api/account', init: { method: 'PATCH', json: { newPassword: 'a-new-password-here' } }, status: 400, field: 'currentPassword' },
  { what: 'a wrong current password', who: 'student', path: '/api/account', init: { method: 'PATCH', json: { currentPassword: 'not-it-at-all', newPassword: 'a-new-password-here' } }, status: 400, field: 'currentPassword' },
  { what: 'a name of the wrong type', who: 'student', path: '/api/account', init: { method: 'PATCH', json: { name: ['Priya'] } }, status: 400, field: 'name' },
  { what: 'a bank without a document', who: 'student', path: '/api/banks', init: { method: 'POST', json: { name: 'No document' } }, status: 400, field: 'document' },
  { what: 'a bank with a number for name', who: 'student', path: '/api/banks', init: { method: 'POST', json: { name: 7, document: starter } }, status: 400, field: 'name' },
  { what: 'a bank whose transformer has no kVA', who: 'student', path: '/api/banks', init: { method: 'POST', json: { name: 'Bad unit', document: { ...starter, components: [starter.components[0], { ...starter.components[1], kva: -10 }, starter.components[2]] } } }, status: 400, field: 'document.components[1].kva' },
  { what: 'a bank with a wire to nowhere', who: 'student', path: '/api/banks', init: { method: 'POST', json: { name: 'Bad wire', document: { ...starter, wires: [...starter.wires, ['T1.X1', 'T9.H1']] } } }, status: 400, field: 'document.wires[5][1]' },
  { what: 'a bank over 256 KB', who: 'student', path: '/api/banks', init: { method: 'POST', json: huge }, status: 413, field: '(body)' },
  { what: 'a bank in malformed JSON', who: 'student', path: '/api/banks', init: raw('{"name": "x", document: {}}'), status: 400, field: '(body)' },
  { what: 'a save without a version', who: 'student', path: () => `/api/banks/${bankId}`, init: { method: 'PATCH', json: { name: 'No version' } }, status: 400, field: 'version' },
  { what: 'a save with a text version', who: 'student', path: () => `/api/banks/${bankId}`, init: { method: 'PATCH', json: { name: 'Text version', version: '1' } }, status: 400, field: 'version' },
  { what: 'a bank id that is not a number', who: 'student', path: '/api/banks/abc', init: {}, status: 400, field: 'id' },
  { what: 'a list page of 0', who: 'student', path: '/api/banks?page=0', init: {}, status: 400, field: 'page' },
  { what: 'a list sorted by an unknown key', who: 'student', path: '/api/banks?sort=size', init: {}, status: 400, field: 'sort' },
  { what: 'an unknown role', who: 'admin', path: '/api/admin/users?role=wizard', init: {}, status: 400, field: 'role' },
  { what: 'a role change to an unknown role', who: 'admin', path: () => `/api/admin/users/${student.id}`, init: { method: 'PATCH', json: { role: 'wizard' } }, status: 400, field: 'role' },
  { what: 'active as a string', who: 'admin', path: () => `/api/admin/users/${student.id}`, init: { method: 'PATCH', json: { active: 'no' } }, status: 400, field: 'active' },
  { what: 'an invitation without an e-mail', who: 'admin', path: '/api/admin/invitations', init: { method: 'POST', json: { name: 'Someone' } }, status: 400, field: 'email' },
]

describe('invalid input', () => {
  it.each(cases)('$what → $status naming $field', async ({ who, path, init, status, field }) => {
    const call = who === 'anonymous' ? api : (who === 'admin' ? admin : student).call
    const response = await call(typeof path === 'function' ? path() : path, init)
    expect(response.status, response.text).toBe(status)
    const paths = (response.body.data?.errors ?? []).map((error: { path: string }) => error.path)
    expect(paths).toContain(field)
    for (const error of response.body.data.errors) expect(error.message).toEqual(expect.any(String))
    expect(response.text).not.toMatch(/\n\s+at |node_modules|\.output/)
  })

  // a component's extra field (kept as sent) nested in lists: the body may nest 32 deep, so the
  // stored document, one level in, stays within MariaDB's 32
  const withExtra = (lists: number) => ({ name: `Deep extra ${lists}`, document: { ...starter, components: [{ ...starter.components[0], extra: JSON.parse(`${'['.repeat(lists)}${']'.repeat(lists)}`) }, ...starter.components.slice(1)] } })

  it('saves a bank whose extra field nests as deep as a body may, and reads it back', async () => {
    const r = await student.call('/api/banks', { method: 'POST', json: withExtra(28) })
    expect(r.status, r.text).toBe(201)
    const back = await student.call(`/api/banks/${r.body.id}`)
    expect(JSON.stringify(back.body.document.components[0].extra)).toBe(`${'['.repeat(28)}${']'.repeat(28)}`)
  })

  it.each([29, 31, 200])('refuses an extra field nested %i lists deep with 400 naming it, not a 500 from the database', async (lists) => {
    const r = await student.call('/api/banks', { method: 'POST', json: withExtra(lists) })
    expect(r.status, r.text.slice(0, 300)).toBe(400)
    expect(r.body.data.errors[0].path).toBe(`document.components[0].extra${'[0]'.repeat(28)}`)
  })

  it('checks the session before the body: anonymous with a bad body is 401', async () => {
    const response = await api('/api/banks', raw('{not json'))
    expect(response.status).toBe(401)
  })
})
