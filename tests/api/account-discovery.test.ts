// Nothing tells whether an address has an account: "forgot password" and sign-up answer the
// same words in the same time for both (their mail goes out later, from the mail queue, never
// inside the request; sign-up's account is made only from the mailed link). The queue's sender
// loop delivers, and tries a failed message again later.
import { setTimeout as sleep } from 'node:timers/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { and, eq, like } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { mailQueue, pendingSignUps, users } from '../../server/db/schema'
import { api, databaseURL } from './helpers'
import { as, confirmToken, firstLink, mailTo, newPerson, PASSWORD, sessionCookie, uniqueEmail, type Person } from './people'

const db = createDB(databaseURL, { connectionLimit: 2 })
let person: Person

beforeAll(async () => {
  person = await newPerson('student', databaseURL, 'discovery')
})

afterAll(async () => {
  await db.$client.end()
})

const forgot = (email: string) => api('/api/auth/forgot', { method: 'POST', json: { email } })

async function timed(email: string): Promise<number> {
  const started = performance.now()
  const response = await forgot(email)
  const took = performance.now() - started
  expect(response.status).toBe(202)
  return took
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length / 2
  return sorted.length % 2 ? sorted[Math.floor(middle)]! : (sorted[middle - 1]! + sorted[middle]!) / 2
}

describe('POST /api/auth/forgot', () => {
  it('answers the same status and body for an address with an account and one without', async () => {
    const known = await forgot(person.email)
    const unknown = await forgot(uniqueEmail('discovery-nobody'))
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(known.status)
    expect(unknown.text).toBe(known.text)
    expect(unknown.headers.get('content-type')).toBe(known.headers.get('content-type'))
    // and the owner's link does arrive, from the queue
    const mail = await mailTo(person.email)
    expect(firstLink(mail.text).pathname).toBe('/reset')
  })

  it('takes the same time: medians over 20 tries of each differ by less than 20 ms', async () => {
    // a few rounds first, so neither side pays for warming up
    for (let i = 0; i < 3; i++) {
      await timed(person.email)
      await timed(uniqueEmail('discovery-warm'))
    }
    const known: number[] = []
    const unknown: number[] = []
    for (let i = 0; i < 20; i++) {
      // interleaved, so a slow moment of the machine falls on both alike
      known.push(await timed(person.email))
      unknown.push(await timed(uniqueEmail('discovery-timing')))
    }
    const difference = Math.abs(median(known) - median(unknown))
    expect(difference, `known ${median(known).toFixed(1)} ms, unknown ${median(unknown).toFixed(1)} ms`).toBeLessThan(20)
  })
})

describe('the mail queue', () => {
  it('holds each message until the sender loop marks it sent', async () => {
    const email = uniqueEmail('queue-known')
    const owner = await newPerson('student', databaseURL, 'queue-owner')
    expect((await forgot(owner.email)).status).toBe(202)
    await mailTo(owner.email)
    let rows = await db.select().from(mailQueue).where(and(like(mailQueue.message, `%${owner.email}%`), like(mailQueue.message, '%/reset?token=%')))
    for (let i = 0; i < 20 && rows.some(r => r.sentAt === null); i++) {
      await sleep(100)
      rows = await db.select().from(mailQueue).where(and(like(mailQueue.message, `%${owner.email}%`), like(mailQueue.message, '%/reset?token=%')))
    }
    expect(rows).toHaveLength(1)
    expect(rows[0]!.sentAt).not.toBeNull()
    expect(rows[0]!.attempts).toBe(1)
    expect(await db.select().from(mailQueue).where(like(mailQueue.message, `%${email}%`))).toHaveLength(0)
  })

  it('tries a message that fails again later, with the error kept', async () => {
    // no recipient: the SMTP client refuses it, as a mail service would refuse a bad address
    const [row] = await db.insert(mailQueue).values({ message: { to: '', subject: 'Nowhere', text: 'nowhere', html: '<p>nowhere</p>' } }).$returningId()
    let failed
    for (let i = 0; i < 50; i++) {
      [failed] = await db.select().from(mailQueue).where(eq(mailQueue.id, row!.id))
      if (failed?.lastError) break
      await sleep(100)
    }
    expect(failed!.sentAt).toBeNull()
    expect(failed!.attempts).toBe(1)
    expect(failed!.lastError).toBeTruthy()
    // the next try waits (10 s after the first failure, doubling after each)
    expect(failed!.nextAttemptAt.getTime() - Date.now()).toBeGreaterThan(5_000)
    await db.update(mailQueue).set({ attempts: 99 }).where(eq(mailQueue.id, row!.id))
  })
})

const signUp = (email: string, name = 'Discovery Newcomer') =>
  api('/api/auth/sign-up', { method: 'POST', json: { name, email, password: PASSWORD, role: 'student' } })
const confirm = (token: string) => api('/api/auth/confirm-sign-up', { method: 'POST', json: { token } })

describe('POST /api/auth/sign-up', () => {
  it('answers the same status and body for a registered address and a new one; the owner gets a note, not a link', async () => {
    const known = await signUp(person.email, 'Someone Else')
    const fresh = uniqueEmail('discovery-new')
    const unknown = await signUp(fresh)
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(known.status)
    expect(unknown.text).toBe(known.text)
    expect(known.body.message).toBe('Check your e-mail: we sent a link to finish making the account.')
    expect(unknown.headers.get('content-type')).toBe(known.headers.get('content-type'))
    expect(sessionCookie(known)).toBe('')
    expect(sessionCookie(unknown)).toBe('')
    const note = await mailTo(person.email, { match: 'Someone tried' })
    expect(note.text).toContain('Someone tried to make a Phaseloom account with this address. If it was you, sign in or reset your password; if not, ignore this.')
    expect(note.text).not.toContain('/sign-up/confirm')
    const link = firstLink((await mailTo(fresh)).text)
    expect(link.pathname).toBe('/sign-up/confirm')
    // no account until the link is followed
    expect(await db.select().from(users).where(eq(users.email, fresh))).toHaveLength(0)
  })

  it('takes the same time: medians over 20 interleaved tries of each differ by less than 20 ms', async () => {
    const timedSignUp = async (email: string) => {
      const started = performance.now()
      const response = await signUp(email)
      const took = performance.now() - started
      expect(response.status).toBe(202)
      return took
    }
    for (let i = 0; i < 3; i++) {
      await timedSignUp(person.email)
      await timedSignUp(uniqueEmail('discovery-warm-up'))
    }
    const known: number[] = []
    const unknown: number[] = []
    for (let i = 0; i < 20; i++) {
      known.push(await timedSignUp(person.email))
      unknown.push(await timedSignUp(uniqueEmail('discovery-sign-up-timing')))
    }
    const difference = Math.abs(median(known) - median(unknown))
    expect(difference, `known ${median(known).toFixed(1)} ms, unknown ${median(unknown).toFixed(1)} ms`).toBeLessThan(20)
  })

  it('makes the account from the mailed link and signs in; the link works once', async () => {
    const email = uniqueEmail('discovery-confirm')
    expect((await signUp(email, 'Marta Quill')).status).toBe(202)
    const token = confirmToken(await mailTo(email))
    const made = await confirm(token)
    expect(made.status).toBe(201)
    expect(made.body).toEqual({ user: { id: expect.any(Number), name: 'Marta Quill', role: 'student' } })
    const session = await as(sessionCookie(made))('/api/_auth/session')
    expect(session.status).toBe(200)
    expect(session.body.user.id).toBe(made.body.user.id)
    expect((await api('/api/auth/sign-in', { method: 'POST', json: { email, password: PASSWORD } })).status).toBe(200)
    const again = await confirm(token)
    expect(again.status).toBe(404)
    expect(sessionCookie(again)).toBe('')
    expect(await db.select().from(users).where(eq(users.email, email))).toHaveLength(1)
  })

  it('answers the same 404 for a wrong, an expired and a used link, and for an address taken meanwhile', async () => {
    const wrong = await confirm('no-such-sign-up-token-0123456789')
    expect(wrong.status).toBe(404)

    const late = uniqueEmail('discovery-expired')
    await signUp(late)
    const lateToken = confirmToken(await mailTo(late))
    await db.update(pendingSignUps).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(pendingSignUps.email, late))
    const expired = await confirm(lateToken)
    expect(expired.status).toBe(404)
    expect(expired.text).toBe(wrong.text)
    expect(await db.select().from(users).where(eq(users.email, late))).toHaveLength(0)

    // two links for one address: the first makes the account, the second finds it taken
    const twice = uniqueEmail('discovery-twice')
    await signUp(twice, 'First Try')
    const first = confirmToken(await mailTo(twice))
    await signUp(twice, 'Second Try')
    const second = confirmToken(await mailTo(twice, { match: 'Second Try' }))
    expect(second).not.toBe(first)
    expect((await confirm(second)).status).toBe(201)
    const taken = await confirm(first)
    expect(taken.status).toBe(404)
    expect(taken.text).toBe(wrong.text)
    expect((await db.select().from(users).where(eq(users.email, twice))).map(u => u.name)).toEqual(['Second Try'])
  })
})
