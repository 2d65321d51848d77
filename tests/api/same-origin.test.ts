// A state-changing request whose Origin is another site is refused (403), before the session
// or the body is looked at; the same request from our own pages, or from a client that is not
// a browser, goes through.
import { beforeAll, describe, expect, it } from 'vitest'
import starter from '../../examples/one-unit-series.json'
import { baseURL, databaseURL } from './helpers'
import { newPerson, type Person } from './people'

let person: Person
beforeAll(async () => {
  person = await newPerson('student', databaseURL, 'origin')
})

const save = (headers: Record<string, string>) => person.call('/api/banks', { method: 'POST', json: { name: 'origin check', document: starter }, headers })

describe('cross-site requests', () => {
  it.each([
    ['another site\'s Origin', { origin: 'https://evil.example' }],
    ['a look-alike host', { origin: `${new URL(baseURL).protocol}//${new URL(baseURL).hostname}.evil.example:${new URL(baseURL).port}` }],
    ['an opaque (null) Origin', { origin: 'null' }],
    ['Sec-Fetch-Site: cross-site', { 'sec-fetch-site': 'cross-site' }],
  ])('refuses a save with %s', async (_, headers) => {
    const before = (await person.call('/api/banks?q=origin+check')).body.total
    const r = await save(headers)
    expect(r.status).toBe(403)
    expect(r.body.data.errors[0].path).toBe('(origin)')
    expect((await person.call('/api/banks?q=origin+check')).body.total).toBe(before)
  })

  it('refuses a cross-site sign-in too (no session needed to be refused)', async () => {
    const r = await person.call('/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: person.password }, headers: { origin: 'https://evil.example' } })
    expect(r.status).toBe(403)
  })

  it('accepts the same save from our own origin, same-origin fetch metadata, or no browser at all', async () => {
    expect((await save({ origin: new URL(baseURL).origin, 'sec-fetch-site': 'same-origin' })).status).toBe(201)
    expect((await save({})).status).toBe(201)
  })

  it('leaves reads alone', async () => {
    expect((await person.call('/api/banks', { headers: { origin: 'https://evil.example' } })).status).toBe(200)
  })
})
