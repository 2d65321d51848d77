// Two app servers on two ports against one MariaDB, as behind a load balancer: a session
// made on one is good on the other, what one saves the other reads, and the sign-in limit
// counts failures on both together (its store is the database).
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import starter from '../../examples/one-unit-series.json'
import { api, baseURL, databaseURL, scratchDir } from './helpers'
import { newPerson, uniqueEmail, type Person } from './people'
import { startServer } from './servers'

let second: Awaited<ReturnType<typeof startServer>> | undefined
let person: Person

beforeAll(async () => {
  second = await startServer({
    port: await freePort(),
    env: { NUXT_DATABASE_URL: databaseURL, NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!, NUXT_PUBLIC_BASE_URL: baseURL },
    logFile: join(scratchDir, 'second-server.log'),
  })
  person = await newPerson('student', databaseURL, 'two-instances')
})
afterAll(async () => {
  await second?.stop()
})

const onSecond = (path: string, init: Parameters<typeof api>[1] = {}) => api(path, { ...init, base: second!.baseURL })

describe('two app instances, one database', () => {
  it('share sessions: a cookie from one is good on the other', async () => {
    const r = await onSecond('/api/banks', { headers: { cookie: person.cookie } })
    expect(r.status).toBe(200)
    expect((await onSecond('/api/banks')).status).toBe(401)
  })

  it('share data: a bank saved through one is read and changed through the other, with one version count', async () => {
    const saved = await person.call('/api/banks', { method: 'POST', json: { name: 'made on the first', document: starter } })
    expect(saved.status).toBe(201)
    const read = await onSecond(`/api/banks/${saved.body.id}`, { headers: { cookie: person.cookie } })
    expect(read.body).toMatchObject({ name: 'made on the first', version: 1 })
    const renamed = await onSecond(`/api/banks/${saved.body.id}`, { method: 'PATCH', json: { name: 'renamed on the second', version: 1 }, headers: { cookie: person.cookie } })
    expect(renamed.status).toBe(200)
    const stale = await person.call(`/api/banks/${saved.body.id}`, { method: 'PATCH', json: { name: 'late on the first', version: 1 } })
    expect(stale.status).toBe(409)
  })

  it('share the sign-in limit: failures on both count together', async () => {
    const email = uniqueEmail('two-limit')
    const fail = (on: 'first' | 'second') => (on === 'first' ? api : onSecond)('/api/auth/sign-in', { method: 'POST', json: { email, password: 'not-the-password' } })
    const statuses = [await fail('first'), await fail('second'), await fail('first'), await fail('second'), await fail('first')].map(r => r.status)
    expect(statuses).toEqual([401, 401, 401, 401, 401])
    expect((await fail('second')).status).toBe(429)
    expect((await fail('first')).status).toBe(429)
  })
})
