// The database stops in the middle of the working day: every route that needs it answers 503
// with a plain message (never a 500, never a stack trace), nothing is half-written, and the
// same server works again as soon as the database is back, without a restart. This file
// starts its own MariaDB and its own copy of the built server.
import { mkdtempSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureMariaDB, freePort } from '../../scripts/db.mjs'
import { migrateDatabase } from '../../scripts/migrate.mjs'
import { startServer } from '../../scripts/setup.mjs'
import starter from '../../examples/one-unit-series.json'
import { api, scratchDir, type ApiInit } from './helpers'
import { signUpAndConfirm } from './people'

const dataDir = mkdtempSync(join(scratchDir, 'database-away-'))
let dbPort = 0
let database: Awaited<ReturnType<typeof ensureMariaDB>> | undefined
let server: Awaited<ReturnType<typeof startServer>> | undefined
let cookie = ''
let bankId = 0

const startDatabase = () => ensureMariaDB({ dataDir: join(dataDir, 'mariadb'), port: dbPort, log: () => {} })
const call = (path: string, init: ApiInit = {}) => api(path, { ...init, base: server!.baseURL, headers: { cookie, ...(init.headers as Record<string, string> | undefined) }, signal: AbortSignal.timeout(20_000) })

beforeAll(async () => {
  dbPort = await freePort()
  database = await startDatabase()
  await migrateDatabase(database.url)
  server = await startServer({
    port: await freePort(),
    env: { NUXT_DATABASE_URL: database.url, NUXT_SESSION_PASSWORD: 'database-away-test-session-password-0123456789', NUXT_SESSION_COOKIE_SECURE: 'false' },
    logFile: join(dataDir, 'server.log'),
  })
  // this server has no mail catcher: the sign-up link is read from the message it queued
  cookie = (await signUpAndConfirm({ name: 'Away Tester', email: 'away@phaseloom.test', password: 'correct-horse-battery', role: 'student' }, { base: server.baseURL, queueDatabaseURL: database.url })).cookie
  const saved = await call('/api/banks', { method: 'POST', json: { name: 'before the outage', document: starter } })
  expect(saved.status).toBe(201)
  bankId = saved.body.id
})

afterAll(async () => {
  await server?.stop()
  await database?.stop()
})

describe('when the database goes away', () => {
  it('answers 503 with a plain message on every kind of route', async () => {
    await database!.stop()
    const requests: [string, ApiInit][] = [
      ['/api/banks', {}],
      [`/api/banks/${bankId}`, {}],
      ['/api/banks', { method: 'POST', json: { name: 'during the outage', document: starter } }],
      [`/api/banks/${bankId}`, { method: 'PATCH', json: { name: 'renamed in the outage', version: 1 } }],
      ['/api/classes', {}],
      ['/api/lab-sheets', {}],
    ]
    for (const [path, init] of requests) {
      const r = await call(path, init)
      expect(r.status, `${init.method ?? 'GET'} ${path}: ${r.text}`).toBe(503)
      expect(r.body.statusMessage).toBe('The database is not answering')
      expect(r.text).not.toMatch(/at .*\.(m?js|ts):\d+/)
    }
    const signIn = await api('/api/auth/sign-in', { base: server!.baseURL, method: 'POST', json: { email: 'away@phaseloom.test', password: 'correct-horse-battery' }, signal: AbortSignal.timeout(20_000) })
    expect(signIn.status).toBe(503)
  })

  it('works again when the database is back, without a restart, and nothing from the outage was written', async () => {
    database = await startDatabase()
    const list = await call('/api/banks')
    expect(list.status, list.text).toBe(200)
    expect(list.body.items.map((b: { name: string }) => b.name)).toEqual(['before the outage'])
    const bank = await call(`/api/banks/${bankId}`)
    expect(bank.body).toMatchObject({ name: 'before the outage', version: 1 })
    expect((await call('/api/banks', { method: 'POST', json: { name: 'after the outage', document: starter } })).status).toBe(201)
  })
})
