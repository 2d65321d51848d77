// With the database frozen or stopped, /api/health must say so (503) instead of hanging,
// and recover when the database returns. This file starts its own MariaDB and its own copy of
// the built server, so the run's shared server and database are never disturbed.
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureMariaDB, freePort } from '../../scripts/db.mjs'
import { startServer } from '../../scripts/setup.mjs'
import { api, scratchDir } from './helpers'

const dataDir = mkdtempSync(join(scratchDir, 'health-down-'))
let dbPort = 0
let database: Awaited<ReturnType<typeof ensureMariaDB>> | undefined
let server: Awaited<ReturnType<typeof startServer>> | undefined

/** Waits until the kernel reports every thread of the process stopped (state T), so that no query already under way is answered after the freeze. */
async function stopped(pid: number) {
  const threads = () => readdirSync(`/proc/${pid}/task`)
  for (let i = 0; i < 200; i++) {
    if (threads().every((tid) => /\) T /.test(readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8')))) return
    await new Promise((resolve) => setTimeout(resolve, 10))
  }
  throw new Error(`the database (pid ${pid}) did not stop`)
}

const startDatabase = () => ensureMariaDB({ dataDir: join(dataDir, 'mariadb'), port: dbPort, log: () => {} })

beforeAll(async () => {
  dbPort = await freePort()
  database = await startDatabase()
  server = await startServer({
    port: await freePort(),
    env: { NUXT_DATABASE_URL: database.url, NUXT_SESSION_PASSWORD: 'health-down-test-session-password-0123456789' },
    logFile: join(dataDir, 'server.log'),
  })
})

afterAll(async () => {
  await server?.stop()
  await database?.stop()
})

describe('GET /api/health when the database stops', () => {
  it('is ok while the database runs', async () => {
    const response = await api('/api/health', { base: server!.baseURL })
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ ok: true, db: 'ok' })
  })

  it('answers 503 rather than hang while the database is frozen', async () => {
    // SIGSTOP: the server still holds its port, so connections open but nothing answers
    process.kill(database!.pid!, 'SIGSTOP')
    try {
      await stopped(database!.pid!)
      const response = await api('/api/health', { base: server!.baseURL, signal: AbortSignal.timeout(15_000) })
      expect(response.status).toBe(503)
      expect(response.body).toMatchObject({ ok: false, db: 'down' })
    }
    finally {
      process.kill(database!.pid!, 'SIGCONT')
    }
  })

  it('is ok again once the database thaws', async () => {
    const response = await api('/api/health', { base: server!.baseURL })
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ ok: true, db: 'ok' })
  })

  it('answers 503 with db "down" once the database is stopped', async () => {
    await database!.stop()
    const response = await api('/api/health', { base: server!.baseURL, signal: AbortSignal.timeout(10_000) })
    expect(response.status).toBe(503)
    expect(response.body).toMatchObject({ ok: false, db: 'down' })
  })

  it('is ok again when the database comes back', async () => {
    database = await startDatabase()
    const response = await api('/api/health', { base: server!.baseURL })
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ ok: true, db: 'ok' })
  })
})
