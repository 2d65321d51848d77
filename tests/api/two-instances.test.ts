// Two app servers on two ports against one MariaDB, as behind a load balancer: a session
// made on one is good on the other, and a sign-out or "sign out everywhere" on one ends it on
// both; what one saves the other reads; the sign-in limit counts failures on both together
// (its store is the database); both run the mail sender loop, and each message goes out once.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import starter from '../../examples/one-unit-series.json'
import { api, baseURL, databaseURL, scratchDir } from './helpers'
import { as, newPerson, outboxDir, PASSWORD, signIn, uniqueEmail, type Person } from './people'
import { startServer } from './servers'

let second: Awaited<ReturnType<typeof startServer>> | undefined
let person: Person

beforeAll(async () => {
  second = await startServer({
    port: await freePort(),
    env: {
      NUXT_DATABASE_URL: databaseURL,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!,
      NUXT_PUBLIC_BASE_URL: baseURL,
      // the same mail service as the run's server: both sender loops work one queue
      NUXT_MAIL_HOST: '127.0.0.1',
      NUXT_MAIL_PORT: process.env.PHASELOOM_MAIL_PORT!,
    },
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

  it('share sign-out: a cookie signed out on one is refused on both', async () => {
    const cookie = await signIn(person.email, PASSWORD)
    expect((await onSecond('/api/banks', { headers: { cookie } })).status).toBe(200)
    expect((await onSecond('/api/auth/sign-out', { method: 'POST', headers: { cookie } })).status).toBe(204)
    expect((await as(cookie)('/api/banks')).status).toBe(401)
    expect((await onSecond('/api/banks', { headers: { cookie } })).status).toBe(401)
    // the person's other session is untouched
    expect((await person.call('/api/banks')).status).toBe(200)
  })

  it('share "sign out everywhere": asked on the second, it ends sessions made on the first', async () => {
    const someone = await newPerson('practitioner', databaseURL, 'two-everywhere')
    const another = await signIn(someone.email, PASSWORD)
    expect((await onSecond('/api/account/sign-out-all', { method: 'POST', headers: { cookie: another } })).status).toBe(204)
    for (const cookie of [someone.cookie, another]) {
      expect((await as(cookie)('/api/banks')).status).toBe(401)
      expect((await onSecond('/api/banks', { headers: { cookie } })).status).toBe(401)
    }
  })

  it('send each queued message once, though both instances send from one queue', async () => {
    const people = await Promise.all(Array.from({ length: 8 }, (_, i) => newPerson('student', databaseURL, `two-mail-${i}`)))
    await Promise.all(people.map((p, i) => (i % 2 ? api : onSecond)('/api/auth/forgot', { method: 'POST', json: { email: p.email } })))
    const delivered = (email: string) => readdirSync(outboxDir).filter(name => name.endsWith('.json'))
      .map(name => JSON.parse(readFileSync(join(outboxDir, name), 'utf8')) as { to: string[], subject: string })
      .filter(m => m.to.includes(email) && /password/i.test(m.subject))
    const until = Date.now() + 15_000
    while (people.some(p => delivered(p.email).length === 0) && Date.now() < until) await sleep(100)
    // a little longer, for any second copy to show itself
    await sleep(1_500)
    expect(people.map(p => delivered(p.email).length)).toEqual(people.map(() => 1))
  })
})
