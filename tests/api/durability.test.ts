// Durability: 500 bank saves (new banks and new versions of them) while the app server is
// killed with SIGKILL at random moments and restarted, and the database is killed with
// SIGKILL once too. Every save that was answered 2xx must be in the database afterwards,
// and nothing may be half-written: every stored document parses as a circuit document,
// each bank's versions follow one another with no gap, and each stored row (name, version
// and document, written by one statement) is exactly one save we sent, never a mix of two.
// A save whose answer was lost in a crash (connection reset, 5xx) may or may not have been
// committed; the test accepts either, but only in its entirety.
// This file starts its own MariaDB and its own copy of the built server.
import { mkdtempSync } from 'node:fs'
import { join } from 'node:path'
import { isDeepStrictEqual } from 'node:util'
import { setTimeout as sleep } from 'node:timers/promises'
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureMariaDB, freePort } from '../../scripts/db.mjs'
import { migrateDatabase } from '../../scripts/migrate.mjs'
import { startServer } from '../../scripts/setup.mjs'
import { parseCircuit } from '../../shared/circuit/parse'
import { starterBySlug } from '../../shared/starters'
import { api, scratchDir, type ApiInit } from './helpers'
import { signUpAndConfirm } from './people'

const SAVES = 500
const WORKERS = 4
const VERSIONS_PER_BANK = 10
const base = starterBySlug('closed-delta-240')!.document as unknown as { name?: string, layout?: Record<string, { x: number, y: number }> } & Record<string, unknown>

const dataDir = mkdtempSync(join(scratchDir, 'durability-'))
const serverLog = join(dataDir, 'server.log')
const sessionPassword = 'durability-test-session-password-0123456789'
let dbPort = 0
let appPort = 0
let database: Awaited<ReturnType<typeof ensureMariaDB>> | undefined
let server: Awaited<ReturnType<typeof startServer>> | undefined
const startDatabase = () => ensureMariaDB({ dataDir: join(dataDir, 'mariadb'), port: dbPort, log: () => {} })
const startApp = () => startServer({
  port: appPort,
  env: { NUXT_DATABASE_URL: database!.url, NUXT_SESSION_PASSWORD: sessionPassword, NUXT_SESSION_COOKIE_SECURE: 'false' },
  logFile: serverLog,
})
const appURL = () => `http://127.0.0.1:${appPort}`

/** One save we sent: a new bank (version 1) or a new version of a bank. */
interface Save {
  name: string
  worker: number
  kind: 'create' | 'patch'
  /** the bank's id (for a create, known only once it was answered) */
  bankId: number | null
  /** the version this save makes */
  version: number
  document: Record<string, unknown>
  outcome: 'acknowledged' | 'unknown' | 'refused'
  status: number | null
}
const saves: Save[] = []
const events: string[] = []
let sent = 0

/** A document that says which save it is, in its name and its layout. */
function documentFor(name: string, n: number): Record<string, unknown> {
  const layout = Object.fromEntries(Object.entries(base.layout ?? {}).map(([id, p], i) => [id, { x: p.x + (i === 0 ? n : 0), y: p.y }]))
  return { ...base, name, layout }
}

/** A request that never throws: a lost connection is status null. */
async function attempt(cookie: string, path: string, init: ApiInit) {
  try {
    return await api(path, { ...init, base: appURL(), headers: { cookie }, signal: AbortSignal.timeout(15_000) })
  }
  catch {
    return null
  }
}

/** Waits until the app (and through it the database) answers again. */
async function healthy() {
  for (let i = 0; i < 600; i++) {
    const r = await attempt('', '/api/health', {})
    if (r?.status === 200) return
    await sleep(100)
  }
  throw new Error('the app did not come back within a minute')
}

async function worker(index: number, cookie: string) {
  let bank: { id: number, version: number } | null = null
  let n = 0
  while (sent < SAVES) {
    sent += 1
    n += 1
    const name = `w${index}-save${n}`
    const creating = bank === null || bank.version >= VERSIONS_PER_BANK
    const save: Save = { name, worker: index, kind: creating ? 'create' : 'patch', bankId: creating ? null : bank!.id, version: creating ? 1 : bank!.version + 1, document: documentFor(name, n), outcome: 'unknown', status: null }
    saves.push(save)
    const r = creating
      ? await attempt(cookie, '/api/banks', { method: 'POST', json: { name, document: save.document } })
      : await attempt(cookie, `/api/banks/${bank!.id}`, { method: 'PATCH', json: { name, document: save.document, version: bank!.version } })
    save.status = r?.status ?? null
    if (r && r.status >= 200 && r.status < 300) {
      save.outcome = 'acknowledged'
      if (creating) save.bankId = r.body.id
      expect(r.body.version).toBe(save.version)
      bank = { id: save.bankId!, version: save.version }
      continue
    }
    if (r && r.status >= 400 && r.status < 500) save.outcome = 'refused'
    // the answer is lost (or refused): wait for the app, then learn the bank's real version
    await healthy()
    if (creating) {
      bank = null // a new bank next time; this one, if it was made, is checked at the end
      continue
    }
    for (;;) {
      const current = await attempt(cookie, `/api/banks/${bank!.id}`, {})
      if (current?.status === 200) {
        bank = { id: bank!.id, version: current.body.version }
        break
      }
      await healthy()
    }
  }
}

beforeAll(async () => {
  dbPort = await freePort()
  appPort = await freePort()
  database = await startDatabase()
  await migrateDatabase(database.url)
  server = await startApp()
})

afterAll(async () => {
  await server?.stop()
  await database?.stop()
})

describe('saves through crashes', () => {
  const owners: number[] = []

  it(`keeps every acknowledged save of ${SAVES}, whole, with the app killed twice and the database once`, async () => {
    const cookies: string[] = []
    for (let i = 0; i < WORKERS; i++) {
      // this server has no mail catcher: the sign-up link is read from the message it queued
      const made = await signUpAndConfirm({ name: `Durable ${i}`, email: `durable-${i}@phaseloom.test`, password: 'correct-horse-battery', role: 'practitioner' }, { base: appURL(), queueDatabaseURL: database!.url })
      owners.push(made.id)
      cookies.push(made.cookie)
    }

    // three crashes at random points of the run: the app, the database, the app
    const points = [0, 0, 0].map(() => 40 + Math.floor(Math.random() * (SAVES - 80))).sort((a, b) => a - b)
    const kinds = ['app', 'database', 'app'] as const
    const crashes = (async () => {
      for (const [i, point] of points.entries()) {
        while (sent < point) await sleep(2)
        await sleep(Math.random() * 20)
        const at = sent
        if (kinds[i] === 'app') {
          const old = server!
          old.child.kill('SIGKILL')
          await old.stop() // waits for the exit (and closes its log)
          server = await startApp()
        }
        else {
          process.kill(database!.pid!, 'SIGKILL')
          await database!.stop() // waits for the exit, stops its guardian
          database = await startDatabase()
        }
        events.push(`${kinds[i]} killed with SIGKILL after save ${at} (point ${point}), restarted by save ${sent}`)
      }
    })()
    await Promise.all([crashes, ...cookies.map((cookie, i) => worker(i, cookie))])
    console.log(`durability: ${events.join('; ')}`)

    expect(saves).toHaveLength(SAVES)
    expect(events).toHaveLength(3)
    const acknowledged = saves.filter(s => s.outcome === 'acknowledged')
    // the crashes cost a few saves each, not the run
    expect(acknowledged.length).toBeGreaterThan(SAVES * 0.8)
    // nothing was refused: every answer was a 2xx, a 5xx of an outage or a lost connection
    expect(saves.filter(s => s.outcome === 'refused').map(s => `${s.name}: ${s.status}`)).toEqual([])
  }, 180_000)

  it('finds every acknowledged save in the database, none half-written, versions without gaps', async () => {
    const connection = await mysql.createConnection({ uri: database!.url })
    let rows: { id: number, owner_id: number, name: string, version: number, document: unknown }[]
    try {
      const [result] = await connection.query(`SELECT id, owner_id, name, version, document FROM banks WHERE owner_id IN (${owners.map(Number).join(',')}) ORDER BY id`)
      rows = result as typeof rows
    }
    finally {
      await connection.end()
    }
    const byName = new Map(saves.map(s => [s.name, s]))
    const byBank = new Map(rows.map(row => [row.id, row]))

    // every stored row is one whole save we sent, parses as a circuit document, and is the newest of its bank
    for (const row of rows) {
      const text = typeof row.document === 'string' ? row.document : JSON.stringify(row.document)
      const document = JSON.parse(text)
      const parsed = parseCircuit(document)
      expect(parsed.ok, `bank ${row.id}: ${JSON.stringify(parsed.ok ? [] : parsed.errors)}`).toBe(true)
      const save = byName.get(row.name)
      expect(save, `bank ${row.id} holds "${row.name}", which was never sent`).toBeDefined()
      expect(save!.outcome).not.toBe('refused')
      expect(row.version).toBe(save!.version)
      expect(isDeepStrictEqual(document, save!.document), `bank ${row.id}: its document is not the one sent with "${row.name}"`).toBe(true)
      if (save!.kind === 'patch' || save!.bankId !== null) expect(save!.bankId).toBe(row.id)
    }

    // every acknowledged save is there: its bank exists at its version or a later one
    for (const save of saves.filter(s => s.outcome === 'acknowledged')) {
      const row = byBank.get(save.bankId!)
      expect(row, `acknowledged ${save.name} (bank ${save.bankId}) is missing`).toBeDefined()
      expect(row!.version).toBeGreaterThanOrEqual(save.version)
    }

    // each bank's saves follow one another: versions 1..stored, one sent save for each,
    // the acknowledged ones never twice
    for (const row of rows) {
      const first = byName.get(row.name)!
      const creation = first.kind === 'create' ? first : saves.find(s => s.kind === 'create' && s.bankId === row.id)!
      expect(creation, `bank ${row.id} has no creating save`).toBeDefined()
      const versions = saves.filter(s => s.kind === 'patch' && s.bankId === row.id && s.version <= row.version)
      const acked = versions.filter(s => s.outcome === 'acknowledged').map(s => s.version)
      expect(new Set(acked).size).toBe(acked.length)
      const covered = new Set([1, ...versions.map(s => s.version)])
      for (let v = 1; v <= row.version; v++) expect(covered.has(v), `bank ${row.id}: no save made version ${v}`).toBe(true)
    }
    console.log(`durability: ${saves.filter(s => s.outcome === 'acknowledged').length} acknowledged, ${saves.filter(s => s.outcome === 'unknown').length} answers lost, ${rows.length} banks stored`)
  })
})
