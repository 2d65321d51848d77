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
 * A new account with `role`, signed in. Students and practitioners sign up as anyone would;
 * instructors and admins are made by changing the role in the database, then signing in.
 */
export async function newPerson(role: Role, databaseURL: string, tag: string = role): Promise<Person> {
  const email = uniqueEmail(tag)
  const name = `Test ${tag}`
  const signUp = await api('/api/auth/sign-up', {
    method: 'POST',
    json: { name, email, password: PASSWORD, role: role === 'practitioner' ? 'practitioner' : 'student' },
  })
  if (signUp.status !== 201) throw new Error(`sign-up answered ${signUp.status}: ${signUp.text}`)
  const id = signUp.body.user.id as number
  let cookie = sessionCookie(signUp)
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

/** Waits (up to `waitMs`) for the mail catcher to hold a message to `to`, and returns the newest. */
export async function mailTo(to: string, { waitMs = 15_000, after = '' } = {}): Promise<CapturedMail> {
  const until = Date.now() + waitMs
  for (;;) {
    const found = readdirSync(outboxDir).filter(name => name.endsWith('.json') && name > after).sort().reverse()
      .map(name => JSON.parse(readFileSync(join(outboxDir, name), 'utf8')) as CapturedMail)
      .find(message => message.to.includes(to))
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

