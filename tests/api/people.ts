// People for the api tests: fresh accounts of each role, signed in, with their session cookie.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import mysql from 'mysql2/promise'
import type { Role } from '../../shared/schemas/account'
import { api, type ApiInit, type ApiResponse } from './helpers'

export const PASSWORD = 'correct-horse-battery'

/** The outbox directory of the run's mail catcher. */
export const outboxDir = process.env.PHASELOOM_OUTBOX_DIR ?? ''

/** The `nuxt-session=...` pair from a response's Set-Cookie, or '' when there is none. */
export function sessionCookie(response: ApiResponse<unknown>): string {
  for (const header of response.headers.getSetCookie()) {
    const pair = header.split(';')[0]!
    if (pair.startsWith('nuxt-session=')) return pair
  }
  return ''
}

export interface Person {
  id: number
  email: string
  name: string
  role: Role
  password: string
  cookie: string
  /** api() with this person's session cookie. */
  call: <T = any>(path: string, init?: ApiInit) => Promise<ApiResponse<T>>
}

export function as(cookie: string) {
  return <T = any>(path: string, init: ApiInit = {}) => {
    const headers = new Headers(init.headers)
    if (cookie) headers.set('cookie', cookie)
    return api<T>(path, { ...init, headers })
  }
}

let counter = 0
export function uniqueEmail(tag: string): string {
  counter += 1
  return `${tag}-${process.pid}-${Date.now()}-${counter}@phaseloom.test`
}

export async function signIn(email: string, password: string): Promise<string> {
  const response = await api('/api/auth/sign-in', { method: 'POST', json: { email, password } })
  if (response.status !== 200) throw new Error(`sign-in of ${email} answered ${response.status}: ${response.text}`)
  return sessionCookie(response)
}

/**
 * Signs up as anyone would and follows the mailed link: the account made and signed in, or
 * throws. `base` is the server's address (the run's by default). A test's own server without a
 * mail catcher passes its `queueDatabaseURL`: the link is then read from the message it queued.
 */
export async function signUpAndConfirm(
  body: { name: string, email: string, password: string, role: 'student' | 'practitioner' },
  { base, queueDatabaseURL }: { base?: string, queueDatabaseURL?: string } = {},
): Promise<{ id: number, cookie: string }> {
  const signUp = await api('/api/auth/sign-up', { base, method: 'POST', json: body })
  if (signUp.status !== 202) throw new Error(`sign-up answered ${signUp.status}: ${signUp.text}`)
  let token: string
  if (queueDatabaseURL) {
    token = confirmToken(await queuedMailTo(queueDatabaseURL, body.email))
  }
  else {
    token = confirmToken(await signUpMail(body.email))
  }
  const confirm = await api('/api/auth/confirm-sign-up', { base, method: 'POST', json: { token } })
  if (confirm.status !== 201) throw new Error(`confirm-sign-up answered ${confirm.status}: ${confirm.text}`)
  return { id: confirm.body.user.id as number, cookie: sessionCookie(confirm) }
}

/** The newest message to `to` in a database's mail queue (for a server that has no SMTP host). */
export async function queuedMailTo(databaseURL: string, to: string): Promise<{ text: string }> {
  const connection = await mysql.createConnection({ uri: databaseURL })
  try {
    const [rows] = await connection.query('SELECT message FROM mail_queue ORDER BY id DESC LIMIT 200')
    for (const { message } of rows as { message: unknown }[]) {
      const mail = (typeof message === 'string' ? JSON.parse(message) : message) as { to: string, text: string }
      if (mail.to === to) return mail
    }
    throw new Error(`no mail to ${to} in the queue`)
  }
  finally {
    await connection.end()
  }
}

/** The token of the sign-up link in a confirmation mail. */
export function confirmToken(mail: { text: string }): string {
  const link = firstLink(mail.text)
  if (link.pathname !== '/sign-up/confirm') throw new Error(`not a sign-up link: ${link}`)
  return link.searchParams.get('token') ?? ''
}

/**
 * A new account with `role`, signed in. Students and practitioners sign up as anyone would
 * (the form, then the mailed link); instructors and admins are made by changing the role in
 * the database, then signing in.
 */
export async function newPerson(role: Role, databaseURL: string, tag: string = role): Promise<Person> {
  const email = uniqueEmail(tag)
  const name = `Test ${tag}`
  const made = await signUpAndConfirm({ name, email, password: PASSWORD, role: role === 'practitioner' ? 'practitioner' : 'student' })
  const id = made.id
  let cookie = made.cookie
  if (role === 'instructor' || role === 'admin') {
    const connection = await mysql.createConnection({ uri: databaseURL })
    try {
      await connection.execute('UPDATE users SET role = ?, session_version = session_version + 1 WHERE id = ?', [role, id])
    }
    finally {
      await connection.end()
    }
    cookie = await signIn(email, PASSWORD)
  }
  return { id, email, name, role, password: PASSWORD, cookie, call: as(cookie) }
}

export interface CapturedMail {
  id: string
  to: string[]
  subject: string
  text: string
  html: string
}

/** Catcher files already read by signUpMail: later waits for a person's mail skip them. */
const usedSignUpMails = new Set<string>()

/** Waits for the sign-up link mailed to `to`; mailTo then leaves that message out. */
export async function signUpMail(to: string): Promise<CapturedMail> {
  const mail = await mailTo(to, { match: '/sign-up/confirm' })
  usedSignUpMails.add(mail.file)
  return mail
}

/**
 * Waits (up to `waitMs`) for the mail catcher to hold a message to `to` (whose text holds
 * `match`, when given), and returns the newest. The sign-up links that newPerson followed are
 * left out, so a wait for a person's next message does not find the one that made them.
 */
export async function mailTo(to: string, { waitMs = 15_000, after = '', match = '' } = {}): Promise<CapturedMail & { file: string }> {
  const until = Date.now() + waitMs
  for (;;) {
    const found = readdirSync(outboxDir).filter(name => name.endsWith('.json') && name > after && !usedSignUpMails.has(name)).sort().reverse()
      .map(name => ({ ...JSON.parse(readFileSync(join(outboxDir, name), 'utf8')) as CapturedMail, file: name }))
      .find(message => message.to.includes(to) && message.text.includes(match))
    if (found) return found
    if (Date.now() > until) throw new Error(`no mail to ${to} arrived at the mail catcher`)
    await sleep(100)
  }
}

/** The first http(s) link in a text. */
export function firstLink(text: string): URL {
  const match = text.match(/https?:\/\/\S+/)
  if (!match) throw new Error(`no link in: ${text}`)
  return new URL(match[0])
}

