// A state-changing request whose Origin is another site is refused (403), before the session
// or the body is looked at; the same request from our own pages, or from a client that is not
// a browser, goes through.
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import starter from '../../examples/one-unit-series.json'
import { api, baseURL, databaseURL, scratchDir } from './helpers'
import { newPerson, type Person } from './people'
import { startServer } from './servers'

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
    ['a foreign Origin with X-Forwarded-Host naming that origin', { 'origin': 'https://evil.example', 'x-forwarded-host': 'evil.example' }],
    ['a foreign Origin with X-Forwarded-Host naming our host', { 'origin': 'https://evil.example', 'x-forwarded-host': new URL(baseURL).host }],
    ['a foreign Origin with X-Forwarded-Host and -Proto naming it', { 'origin': 'http://evil.example:8080', 'x-forwarded-host': 'evil.example:8080', 'x-forwarded-proto': 'http' }],
    ['our host and port over the other scheme', { origin: `https://${new URL(baseURL).host}` }],
    ['our host on another port', { origin: `http://${new URL(baseURL).hostname}:${Number(new URL(baseURL).port) === 1 ? 2 : Number(new URL(baseURL).port) - 1}` }],
    ['our host with no port', { origin: `http://${new URL(baseURL).hostname}` }],
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

// Behind a reverse proxy (NUXT_TRUST_PROXY=true) the browser's address is the proxy's, named by
// X-Forwarded-Host and X-Forwarded-Proto; only then do they count, and still in scheme, host and port.
describe('behind a proxy', () => {
  let proxied: Awaited<ReturnType<typeof startServer>> | undefined
  beforeAll(async () => {
    proxied = await startServer({
      port: await freePort(),
      env: { NUXT_DATABASE_URL: databaseURL, NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!, NUXT_PUBLIC_BASE_URL: 'https://phaseloom.example', NUXT_TRUST_PROXY: 'true' },
      logFile: join(scratchDir, 'proxied-server.log'),
    })
  })
  afterAll(async () => {
    await proxied?.stop()
  })
  const saveVia = (headers: Record<string, string>) => api('/api/banks', { base: proxied!.baseURL, method: 'POST', json: { name: 'origin check', document: starter }, headers: { cookie: person.cookie, ...headers } })

  it('accepts the proxy\'s own address, as the forwarded headers name it', async () => {
    expect((await saveVia({ 'origin': 'https://lab.phaseloom.example', 'x-forwarded-host': 'lab.phaseloom.example', 'x-forwarded-proto': 'https' })).status).toBe(201)
    expect((await saveVia({ origin: 'https://phaseloom.example' })).status).toBe(201)
  })

  it.each([
    ['another site', { 'origin': 'https://evil.example', 'x-forwarded-host': 'lab.phaseloom.example', 'x-forwarded-proto': 'https' }],
    ['the forwarded host over the other scheme', { 'origin': 'http://lab.phaseloom.example', 'x-forwarded-host': 'lab.phaseloom.example', 'x-forwarded-proto': 'https' }],
    ['the forwarded host on another port', { 'origin': 'https://lab.phaseloom.example:8443', 'x-forwarded-host': 'lab.phaseloom.example', 'x-forwarded-proto': 'https' }],
  ])('still refuses %s', async (_, headers) => {
    expect((await saveVia(headers)).status).toBe(403)
  })
})
