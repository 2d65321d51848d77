// Forgot password → the message reaches the local mail catcher → its link sets a new
// password once → every old session is signed out.
import { createHash } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq, like } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { mailQueue, passwordResets, sessions } from '../../server/db/schema'
import { api, databaseURL } from './helpers'
import { firstLink, mailTo, newPerson, signIn, uniqueEmail, type Person } from './people'

const db = createDB(databaseURL, { connectionLimit: 2 })
const NEW_PASSWORD = 'a-brand-new-password'
let person: Person
let secondSession = ''

beforeAll(async () => {
  person = await newPerson('student', databaseURL, 'reset')
  secondSession = await signIn(person.email, person.password)
})

afterAll(async () => {
  await db.$client.end()
})

async function forgot(email: string) {
  return api('/api/auth/forgot', { method: 'POST', json: { email } })
}

describe('password reset by e-mail', () => {
  let token = ''

  it('answers 202 whether or not the account exists', async () => {
    const unknown = uniqueEmail('nobody')
    expect((await forgot(unknown)).status).toBe(202)
    await expect(mailTo(unknown, { waitMs: 1_000 })).rejects.toThrow(/no mail/)
    expect(await db.select().from(mailQueue).where(like(mailQueue.message, `%${unknown}%`))).toHaveLength(0)
    expect((await forgot(person.email.toUpperCase())).status).toBe(202)
  })

  it('mails a link to /reset with a token, in plain text and HTML', async () => {
    const mail = await mailTo(person.email)
    expect(mail.subject).toMatch(/Phaseloom/)
    expect(mail.text).toContain(person.name)
    const link = firstLink(mail.text)
    expect(link.pathname).toBe('/reset')
    token = link.searchParams.get('token') ?? ''
    expect(token.length).toBeGreaterThanOrEqual(40)
    expect(mail.html).toContain(link.href.replace(/&/g, '&amp;'))
  })

  it('keeps only a hash of the token', async () => {
    const rows = await db.select().from(passwordResets).where(eq(passwordResets.userId, person.id))
    expect(rows).toHaveLength(1)
    expect(rows[0]!.tokenHash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(JSON.stringify(rows)).not.toContain(token)
  })

  it('sets the new password with the link, once', async () => {
    const reset = await api('/api/auth/reset', { method: 'POST', json: { token, password: NEW_PASSWORD } })
    expect(reset.status, reset.text).toBe(200)
    const again = await api('/api/auth/reset', { method: 'POST', json: { token, password: 'yet-another-password' } })
    expect(again.status).toBe(400)
    expect(again.body.data.errors[0].path).toBe('token')
  })

  it('has signed out every old session: each row revoked', async () => {
    for (const cookie of [person.cookie, secondSession]) {
      const response = await api('/api/banks', { headers: { cookie } })
      expect(response.status).toBe(401)
    }
    const rows = await db.select().from(sessions).where(eq(sessions.userId, person.id))
    expect(rows.length).toBeGreaterThanOrEqual(2)
    expect(rows.every(r => r.revokedAt !== null)).toBe(true)
  })

  it('takes the new password and no longer the old one', async () => {
    const old = await api('/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: person.password } })
    expect(old.status).toBe(401)
    const cookie = await signIn(person.email, NEW_PASSWORD)
    expect((await api('/api/banks', { headers: { cookie } })).status).toBe(200)
  })

  it('refuses a link older than an hour', async () => {
    const since = new Date().toISOString()
    expect((await forgot(person.email)).status).toBe(202)
    const mail = await mailTo(person.email, { after: String(Date.parse(since)) })
    const stale = firstLink(mail.text).searchParams.get('token')!
    await db.update(passwordResets).set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(passwordResets.tokenHash, createHash('sha256').update(stale).digest('hex')))
    const reset = await api('/api/auth/reset', { method: 'POST', json: { token: stale, password: 'too-late-password' } })
    expect(reset.status).toBe(400)
    expect(reset.body.data.errors[0].path).toBe('token')
  })
})
