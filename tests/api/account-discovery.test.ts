// Nothing tells whether an address has an account: "forgot password" answers the same words in
// the same time for both (its mail goes out later, from the mail queue, never inside the
// request). The queue's sender loop delivers, and tries a failed message again later.
import { setTimeout as sleep } from 'node:timers/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq, like } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { mailQueue } from '../../server/db/schema'
import { api, databaseURL } from './helpers'
import { firstLink, mailTo, newPerson, uniqueEmail, type Person } from './people'

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
    let rows = await db.select().from(mailQueue).where(like(mailQueue.message, `%${owner.email}%`))
    for (let i = 0; i < 20 && rows.some(r => r.sentAt === null); i++) {
      await sleep(100)
      rows = await db.select().from(mailQueue).where(like(mailQueue.message, `%${owner.email}%`))
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
