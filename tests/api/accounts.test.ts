// Accounts: the session cookie, what the session holds, sign-up, revocable sessions (a row
// per sign-in: sign-out and "sign out everywhere" end them), account changes, admin changes
// that sign a user out, and instructor invitations by e-mail.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { sessions, users } from '../../server/db/schema'
import { api, databaseURL } from './helpers'
import { as, confirmToken, firstLink, mailTo, newPerson, PASSWORD, sessionCookie, signIn, uniqueEmail, type Person } from './people'

let admin: Person
const db = createDB(databaseURL, { connectionLimit: 2 })

beforeAll(async () => {
  admin = await newPerson('admin', databaseURL, 'accounts-admin')
})

afterAll(async () => {
  await db.$client.end()
})

const sessionRows = (userId: number) => db.select().from(sessions).where(eq(sessions.userId, userId))

describe('sign-up and the session', () => {
  it('starts a 7-day, HttpOnly, Secure, SameSite=Lax session holding only id, role and name', async () => {
    const email = uniqueEmail('session')
    expect((await api('/api/auth/sign-up', { method: 'POST', json: { name: 'Ines Calloway', email, password: PASSWORD, role: 'practitioner' } })).status).toBe(202)
    const response = await api('/api/auth/confirm-sign-up', { method: 'POST', json: { token: confirmToken(await mailTo(email)) } })
    expect(response.status).toBe(201)
    expect(response.body).toEqual({ user: { id: expect.any(Number), name: 'Ines Calloway', role: 'practitioner' } })
    const header = response.headers.getSetCookie().find(h => h.startsWith('nuxt-session='))!
    expect(header).toMatch(/; HttpOnly/i)
    expect(header).toMatch(/; Secure/i)
    expect(header).toMatch(/; SameSite=Lax/i)
    const expires = Date.parse(header.match(/Expires=([^;]+)/i)![1]!)
    const week = 7 * 24 * 3600_000
    expect(expires - Date.now()).toBeGreaterThan(week - 3600_000)
    expect(expires - Date.now()).toBeLessThanOrEqual(week)
    const session = await api('/api/_auth/session', { headers: { cookie: sessionCookie(response) } })
    expect(session.body.user).toEqual(response.body.user)
    expect(session.body.secure).toBeUndefined()
    expect(session.text).not.toContain(email)
  })

  it('answers a taken e-mail, whatever its case, as any other (the owner gets a note) and makes no account', async () => {
    const person = await newPerson('student', databaseURL, 'taken')
    const again = await api('/api/auth/sign-up', { method: 'POST', json: { name: 'Again', email: person.email.toUpperCase(), password: PASSWORD, role: 'student' } })
    expect(again.status).toBe(202)
    expect((await mailTo(person.email, { match: 'Someone tried' })).text).not.toContain('/sign-up/confirm')
    expect((await db.select().from(users).where(eq(users.email, person.email))).map(u => u.name)).toEqual(['Test taken'])
  })

  it('signs out with 204 and a cleared cookie', async () => {
    const person = await newPerson('student', databaseURL, 'sign-out')
    const response = await person.call('/api/auth/sign-out', { method: 'POST' })
    expect(response.status).toBe(204)
    const cleared = response.headers.getSetCookie().find(h => h.startsWith('nuxt-session='))!
    expect(cleared).toMatch(/nuxt-session=;|Max-Age=0|Expires=Thu, 01 Jan 1970/i)
  })
})

describe('revocable sessions', () => {
  it('keeps a row per sign-in: a 43-character random id that the cookie does not show, good for 7 days', async () => {
    const person = await newPerson('student', databaseURL, 'session-row')
    const rows = await sessionRows(person.id)
    expect(rows).toHaveLength(1)
    const [row] = rows
    expect(row!.id).toMatch(/^[\w-]{43}$/)
    expect(row!.revokedAt).toBeNull()
    const week = 7 * 24 * 3600_000
    expect(row!.expiresAt.getTime() - row!.createdAt.getTime()).toBeGreaterThan(week - 60_000)
    expect(row!.expiresAt.getTime() - row!.createdAt.getTime()).toBeLessThanOrEqual(week + 60_000)
    expect(decodeURIComponent(person.cookie)).not.toContain(row!.id)
    expect((await person.call('/api/_auth/session')).text).not.toContain(row!.id)
    await signIn(person.email, PASSWORD)
    expect(await sessionRows(person.id)).toHaveLength(2)
  })

  it('an old cookie after sign-out gets 401 everywhere, and other sessions carry on', async () => {
    const person = await newPerson('student', databaseURL, 'session-old')
    const other = await signIn(person.email, PASSWORD)
    const old = person.cookie
    expect((await as(old)('/api/banks')).status).toBe(200)
    expect((await as(old)('/api/auth/sign-out', { method: 'POST' })).status).toBe(204)
    // the browser forgets the cookie; a copy of it kept elsewhere is what this checks
    expect((await as(old)('/api/banks')).status).toBe(401)
    expect((await as(old)('/api/account', { method: 'PATCH', json: { name: 'Not Me' } })).status).toBe(401)
    expect((await as(old)('/api/_auth/session')).status).toBe(401)
    expect((await as(other)('/api/banks')).status).toBe(200)
    const rows = await sessionRows(person.id)
    expect(rows.filter(r => r.revokedAt !== null)).toHaveLength(1)
    expect(rows.filter(r => r.revokedAt === null)).toHaveLength(1)
  })

  it('"sign out everywhere" ends every session of that user and no one else\'s', async () => {
    const person = await newPerson('practitioner', databaseURL, 'session-all')
    const laptop = await signIn(person.email, PASSWORD)
    const bystander = await newPerson('practitioner', databaseURL, 'session-bystander')
    expect((await api('/api/account/sign-out-all', { method: 'POST' })).status).toBe(401)
    const ended = await person.call('/api/account/sign-out-all', { method: 'POST' })
    expect(ended.status).toBe(204)
    expect(ended.headers.getSetCookie().find(h => h.startsWith('nuxt-session='))).toMatch(/nuxt-session=;|Max-Age=0|Expires=Thu, 01 Jan 1970/i)
    for (const cookie of [person.cookie, laptop]) expect((await as(cookie)('/api/banks')).status).toBe(401)
    expect((await bystander.call('/api/banks')).status).toBe(200)
    expect((await sessionRows(person.id)).every(r => r.revokedAt !== null)).toBe(true)
    // signing in again works as ever
    expect((await as(await signIn(person.email, PASSWORD))('/api/banks')).status).toBe(200)
  })

  it('a session row past its expiry is refused even with a good cookie', async () => {
    const person = await newPerson('student', databaseURL, 'session-expired')
    await db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.userId, person.id))
    expect((await person.call('/api/banks')).status).toBe(401)
  })
})

describe('the account page\'s changes', () => {
  it('renames, and a new password signs out the other sessions but not this one', async () => {
    const person = await newPerson('student', databaseURL, 'account')
    const other = await signIn(person.email, PASSWORD)
    const renamed = await person.call('/api/account', { method: 'PATCH', json: { name: 'Renamed Person' } })
    expect(renamed.status).toBe(200)
    expect(renamed.body.user.name).toBe('Renamed Person')
    const changed = await person.call('/api/account', { method: 'PATCH', json: { currentPassword: PASSWORD, newPassword: 'the-second-password' } })
    expect(changed.status).toBe(200)
    const fresh = sessionCookie(changed)
    expect((await as(fresh)('/api/banks')).status).toBe(200)
    expect((await as(other)('/api/banks')).status).toBe(401)
    expect((await as(person.cookie)('/api/banks')).status).toBe(401)
    // the rows decide: every earlier session is revoked, only the fresh one is live
    expect((await sessionRows(person.id)).filter(r => r.revokedAt === null)).toHaveLength(1)
    expect((await api('/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: 'the-second-password' } })).status).toBe(200)
  })
})

describe('admin changes to a user', () => {
  it('lists users with search, role filter and paging', async () => {
    const person = await newPerson('practitioner', databaseURL, 'findme')
    const found = await admin.call(`/api/admin/users?q=${encodeURIComponent(person.email)}`)
    expect(found.status).toBe(200)
    expect(found.body.items).toEqual([{ id: person.id, name: person.name, email: person.email, role: 'practitioner', active: true, createdAt: expect.any(String) }])
    const admins = await admin.call('/api/admin/users?role=admin&pageSize=100')
    expect(admins.body.items.every((row: { role: string }) => row.role === 'admin')).toBe(true)
    const paged = await admin.call('/api/admin/users?pageSize=2&page=2')
    expect(paged.body).toMatchObject({ page: 2, pageSize: 2 })
    expect(paged.body.items.length).toBeLessThanOrEqual(2)
    expect(paged.body.total).toBeGreaterThanOrEqual(5)
  })

  it('a role change signs the user out; after signing in again they have the new role', async () => {
    const person = await newPerson('student', databaseURL, 'promoted')
    const changed = await admin.call(`/api/admin/users/${person.id}`, { method: 'PATCH', json: { role: 'instructor' } })
    expect(changed.status).toBe(200)
    expect(changed.body.role).toBe('instructor')
    expect((await person.call('/api/banks')).status).toBe(401)
    expect((await sessionRows(person.id)).every(r => r.revokedAt !== null)).toBe(true)
    const cookie = await signIn(person.email, PASSWORD)
    expect((await as(cookie)('/api/_auth/session')).body.user.role).toBe('instructor')
  })

  it('a deactivated user is signed out and cannot sign in', async () => {
    const person = await newPerson('student', databaseURL, 'deactivated')
    expect((await admin.call(`/api/admin/users/${person.id}`, { method: 'PATCH', json: { active: false } })).status).toBe(200)
    expect((await person.call('/api/banks')).status).toBe(401)
    expect((await sessionRows(person.id)).every(r => r.revokedAt !== null)).toBe(true)
    const again = await api('/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: PASSWORD } })
    expect(again.status).toBe(403)
  })

  it('an admin cannot demote or switch off themselves', async () => {
    const response = await admin.call(`/api/admin/users/${admin.id}`, { method: 'PATCH', json: { role: 'student' } })
    expect(response.status).toBe(400)
    expect(response.body.data.errors[0].path).toBe('role')
  })
})

describe('instructor invitations', () => {
  it('mail a link that creates an instructor account, once', async () => {
    const email = uniqueEmail('invitee')
    const sent = await admin.call('/api/admin/invitations', { method: 'POST', json: { email, name: 'Oluwaseun Marsh' } })
    expect(sent.status).toBe(201)
    const mail = await mailTo(email)
    expect(mail.subject).toMatch(/Phaseloom/)
    expect(mail.text).toContain(admin.name)
    const link = firstLink(mail.text)
    const token = link.pathname.split('/').pop()!
    expect(link.pathname).toBe(`/invitations/${token}`)
    const invitation = await api(`/api/invitations/${token}`)
    expect(invitation.body).toEqual({ email, name: 'Oluwaseun Marsh', forSignedInUser: false })

    const incomplete = await api(`/api/invitations/${token}/accept`, { method: 'POST', json: {} })
    expect(incomplete.status).toBe(400)
    expect(incomplete.body.data.errors.map((e: { path: string }) => e.path)).toEqual(['name', 'password'])

    const accepted = await api(`/api/invitations/${token}/accept`, { method: 'POST', json: { name: 'Oluwaseun Marsh', password: PASSWORD } })
    expect(accepted.status).toBe(201)
    expect(accepted.body.user).toMatchObject({ name: 'Oluwaseun Marsh', role: 'instructor' })
    expect((await as(sessionCookie(accepted))('/api/banks')).status).toBe(200)
    expect((await api(`/api/invitations/${token}`)).status).toBe(404)
    expect((await api(`/api/invitations/${token}/accept`, { method: 'POST', json: { name: 'X', password: PASSWORD } })).status).toBe(404)
  })

  it('upgrade the signed-in invitee\'s own account, and no one else may use it', async () => {
    const student = await newPerson('student', databaseURL, 'upgrade')
    await admin.call('/api/admin/invitations', { method: 'POST', json: { email: student.email } })
    const token = firstLink((await mailTo(student.email)).text).pathname.split('/').pop()!
    expect((await student.call(`/api/invitations/${token}`)).body.forSignedInUser).toBe(true)
    const anonymous = await api(`/api/invitations/${token}/accept`, { method: 'POST', json: {} })
    expect(anonymous.status).toBe(409)
    const upgraded = await student.call(`/api/invitations/${token}/accept`, { method: 'POST', json: {} })
    expect(upgraded.status).toBe(200)
    expect(upgraded.body.user).toEqual({ id: student.id, name: student.name, role: 'instructor' })
    expect((await as(sessionCookie(upgraded))('/api/_auth/session')).body.user.role).toBe('instructor')
  })
})
