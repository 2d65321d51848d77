// Failed sign-ins: the same 401 for an unknown e-mail and a wrong password; after five
// failures for one e-mail and IP, 429 with Retry-After until the window (15 minutes in
// production) ends. A second app instance with a short window, sharing the database, shows
// that the count lives in MariaDB and that a right password works once the window is over.
// The point is taken before the password is checked, so a burst of parallel guesses gets no
// more than five checked; failures from one address do not lock the owner out on another;
// one address has 100 failures a day, whatever the e-mails; a wrong current password on the
// account page counts like a failed sign-in.
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import { resultsDir, startServer } from './servers'
import { api, databaseURL } from './helpers'
import { newPerson, sessionCookie, uniqueEmail } from './people'
import { cookieOf, fromAddress, loopbackAddress } from './from-address'

const SHORT_WINDOW_SECONDS = 4
let second: Awaited<ReturnType<typeof startServer>> | undefined

beforeAll(async () => {
  second = await startServer({
    port: await freePort(),
    env: {
      NUXT_DATABASE_URL: databaseURL,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!,
      NUXT_SIGN_IN_LIMIT_WINDOW_SECONDS: String(SHORT_WINDOW_SECONDS),
      // a production server: no mail catcher directory, so no outbox
      NUXT_DEV_OUTBOX_DIR: '',
    },
    logFile: join(resultsDir, 'server-short-window.log'),
  })
})

afterAll(async () => {
  await second?.stop()
})

const signIn = (email: string, password: string, base?: string) =>
  api('/api/auth/sign-in', { method: 'POST', json: { email, password }, base })

describe('failed sign-ins', () => {
  it('get the same answer for an unknown e-mail and a wrong password', async () => {
    const person = await newPerson('student', databaseURL, 'limit-same')
    const wrong = await signIn(person.email, 'not-my-password')
    const unknown = await signIn(uniqueEmail('limit-unknown'), 'not-my-password')
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.statusMessage).toBe(unknown.body.statusMessage)
    expect(wrong.body.data).toEqual(unknown.body.data)
  })

  it('six wrong passwords: 401 five times, then 429 with Retry-After of the 15-minute window', async () => {
    const person = await newPerson('student', databaseURL, 'limit-six')
    const statuses: number[] = []
    let last
    for (let attempt = 1; attempt <= 6; attempt++) {
      last = await signIn(person.email, `wrong-password-${attempt}`)
      statuses.push(last.status)
    }
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429])
    const retryAfter = Number(last!.headers.get('retry-after'))
    expect(retryAfter).toBeGreaterThan(14 * 60)
    expect(retryAfter).toBeLessThanOrEqual(15 * 60)
    // even the right password waits for the window
    expect((await signIn(person.email, person.password)).status).toBe(429)
  })

  it('are counted in the database, across app instances, and a right password works after the window', async () => {
    const person = await newPerson('practitioner', databaseURL, 'limit-window')
    for (let attempt = 1; attempt <= 5; attempt++) {
      expect((await signIn(person.email, `wrong-${attempt}`, second!.baseURL)).status).toBe(401)
    }
    // the run's own server sees the five failures the second instance counted
    const blocked = await signIn(person.email, 'wrong-6')
    expect(blocked.status).toBe(429)
    const retryAfter = Number(blocked.headers.get('retry-after'))
    expect(retryAfter).toBeGreaterThanOrEqual(1)
    expect(retryAfter).toBeLessThanOrEqual(SHORT_WINDOW_SECONDS)
    expect((await signIn(person.email, person.password, second!.baseURL)).status).toBe(429)

    await sleep(retryAfter * 1000 + 500)
    const after = await signIn(person.email, person.password, second!.baseURL)
    expect(after.status).toBe(200)
    expect(sessionCookie(after)).toMatch(/^nuxt-session=/)
  })
})

describe('the limit under a burst and from other addresses', () => {
  it('checks at most five of 31 parallel wrong passwords for one e-mail and IP', async () => {
    const person = await newPerson('student', databaseURL, 'limit-burst')
    const address = loopbackAddress()
    const attempt = (password: string) => fromAddress(address, '/api/auth/sign-in', { method: 'POST', json: { email: person.email, password } })
    const burst = await Promise.all(Array.from({ length: 31 }, (_, i) => attempt(`burst-wrong-${i}`)))
    const statuses = burst.map(r => r.status)
    // a 401 is a password that was checked; without the point taken first, all 31 would be
    expect(statuses.filter(s => s === 401)).toHaveLength(5)
    expect(statuses.filter(s => s === 429)).toHaveLength(26)
    expect((await attempt(person.password)).status).toBe(429)
  })

  it('does not lock the owner out from another address', async () => {
    const person = await newPerson('student', databaseURL, 'limit-owner')
    const attacker = loopbackAddress()
    const signInFrom = (address: string, password: string) => fromAddress(address, '/api/auth/sign-in', { method: 'POST', json: { email: person.email, password } })
    for (let attempt = 1; attempt <= 6; attempt++) await signInFrom(attacker, `attacker-${attempt}`)
    expect((await signInFrom(attacker, person.password)).status).toBe(429)
    const owner = await signInFrom(loopbackAddress(), person.password)
    expect(owner.status, owner.text).toBe(200)
    expect((await api('/api/banks', { headers: { cookie: cookieOf(owner) } })).status).toBe(200)
  })

  it('gives one address 100 failed checks a day across e-mails, checked at most 100 times in a burst', async () => {
    const address = loopbackAddress()
    const person = await newPerson('practitioner', databaseURL, 'limit-address')
    const burst = await Promise.all(Array.from({ length: 110 }, (_, i) =>
      fromAddress(address, '/api/auth/sign-in', { method: 'POST', json: { email: uniqueEmail(`spray-${i}`), password: 'sprayed-password' } })))
    const statuses = burst.map(r => r.status)
    expect(statuses.filter(s => s === 401)).toHaveLength(100)
    expect(statuses.filter(s => s === 429)).toHaveLength(10)
    const refused = burst.find(r => r.status === 429)!
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(23 * 3600)
    // that address is spent even for a right password; the owner elsewhere is not
    expect((await fromAddress(address, '/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: person.password } })).status).toBe(429)
    expect((await fromAddress(loopbackAddress(), '/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: person.password } })).status).toBe(200)
  })

  it('limits a wrong current password on the account page like a failed sign-in', async () => {
    const person = await newPerson('student', databaseURL, 'limit-current')
    const address = loopbackAddress()
    const change = (currentPassword: string, from = address) => fromAddress(from, '/api/account', {
      method: 'PATCH', cookie: person.cookie, json: { currentPassword, newPassword: 'a-brand-new-password' },
    })
    const burst = await Promise.all(Array.from({ length: 12 }, (_, i) => change(`not-my-password-${i}`)))
    const statuses = burst.map(r => r.status)
    expect(statuses.filter(s => s === 400)).toHaveLength(5)
    expect(statuses.filter(s => s === 429)).toHaveLength(7)
    const refused = burst.find(r => r.status === 429)!
    expect(refused.body.data.errors[0].path).toBe('currentPassword')
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0)
    expect((await change(person.password)).status).toBe(429)
    // the session itself still works, and from another address the right password does
    expect((await person.call('/api/banks')).status).toBe(200)
    const elsewhere = await change(person.password, loopbackAddress())
    expect(elsewhere.status, elsewhere.text).toBe(200)
  })
})

describe('a production server', () => {
  it('has no development outbox, even for an admin', async () => {
    const admin = await newPerson('admin', databaseURL, 'limit-admin')
    const response = await api('/api/admin/outbox', { base: second!.baseURL, headers: { cookie: admin.cookie } })
    expect(response.status).toBe(404)
    const onDev = await admin.call('/api/admin/outbox')
    expect(onDev.status).toBe(200)
  })
})
