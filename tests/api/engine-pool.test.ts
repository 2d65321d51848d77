// Solves off the request thread: every solve runs in the engine's worker pool with a time
// budget. A second server with a 0.05 s budget shows an over-budget solve answered 422 naming
// the limit while /api/health, asked at the same moment, still answers; the pool carries on
// after the worker running it was ended. Anonymous POST /api/solve is limited per address.
import { request } from 'node:http'
import { join } from 'node:path'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import { solve } from '../../shared/engine'
import { starterBySlug } from '../../shared/starters'
import { resultsDir, startServer } from './servers'
import { api, baseURL, databaseURL } from './helpers'
import { newPerson, type Person } from './people'
import { loadMesh } from '../../scripts/load-mesh.mjs'

const example = JSON.parse(readFileSync(new URL('../../examples/one-unit-series.json', import.meta.url), 'utf8'))


/** POST /api/solve from another loopback address than the other tests use, so its count is its own. */
function solveFrom(localAddress: string, body: unknown): Promise<{ status: number, retryAfter: string | undefined, body: any }> {
  const text = JSON.stringify(body)
  const url = new URL('/api/solve', baseURL)
  return new Promise((resolve, reject) => {
    const req = request({ host: url.hostname, port: url.port, path: url.pathname, method: 'POST', localAddress, headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(text) } }, (res) => {
      let data = ''
      res.setEncoding('utf8')
      res.on('data', (chunk) => { data += chunk })
      res.on('end', () => resolve({ status: res.statusCode ?? 0, retryAfter: res.headers['retry-after'] as string | undefined, body: JSON.parse(data) }))
    })
    req.on('error', reject)
    req.end(text)
  })
}

const BUDGET_SECONDS = 0.05
let tight: Awaited<ReturnType<typeof startServer>> | undefined
let practitioner: Person

beforeAll(async () => {
  practitioner = await newPerson('practitioner', databaseURL, 'engine-budget')
  tight = await startServer({
    port: await freePort(),
    env: {
      NUXT_DATABASE_URL: databaseURL,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!,
      NUXT_ENGINE_BUDGET_SECONDS: String(BUDGET_SECONDS),
      NUXT_DEV_OUTBOX_DIR: '',
    },
    logFile: join(resultsDir, 'server-engine-budget.log'),
  })
})

afterAll(async () => {
  await tight?.stop()
})

describe('the engine pool', () => {
  it('answers exactly what the engine answers in-process', async () => {
    const r = await practitioner.call('/api/solve', { method: 'POST', json: example })
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toMatch(/application\/json/)
    expect(r.body).toEqual(JSON.parse(JSON.stringify(solve(example))))
  })

  it('422 naming the limit for a solve over the budget, while health sent at the same time answers; the pool carries on', async () => {
    const mesh = loadMesh(600, 3300)
    expect(JSON.stringify(mesh).length).toBeLessThan(256 * 1024)
    const solving = practitioner.call('/api/solve', { method: 'POST', json: mesh, base: tight!.baseURL })
    const health = api('/api/health', { base: tight!.baseURL })
    const [big, healthy] = await Promise.all([solving, health])
    expect(healthy.status).toBe(200)
    expect(big.status).toBe(422)
    expect(big.body.statusMessage).toContain(`too large to settle within ${BUDGET_SECONDS} s`)
    expect(big.body.data.limitSeconds).toBe(BUDGET_SECONDS)
    // the worker that ran it was ended and replaced: the next solve is answered
    const small = await practitioner.call('/api/solve', { method: 'POST', json: example, base: tight!.baseURL })
    expect(small.status).toBe(200)
    expect(small.body.energized).toBe(true)
  })

  it('opens a saved bank on the Bench without solving it on the server: the browser solves it', async () => {
    const starter = starterBySlug('closed-delta-240')!.document
    // energized (its breaker closed), so a solve would name its vector group
    const document = { ...starter, components: starter.components.map(c => (c.kind === 'breaker' ? { ...c, closed: true } : c)) }
    expect(solve(document).bank.vectorGroup).toBeTruthy()
    const bank = await practitioner.call('/api/banks', { method: 'POST', json: { name: 'Opened on the Bench', document } })
    expect(bank.status).toBe(201)
    const page = await practitioner.call(`/bench/${bank.body.id}`, { headers: { accept: 'text/html' } })
    expect(page.status).toBe(200)
    expect(page.text).toContain('data-testid="bench-safety"')
    expect(page.text).toContain('Opened on the Bench')
    // the phasor panel names the vector group only from a solve: none was made for this page
    expect(page.text).not.toContain('Vector group')
  })

  it('limits anonymous solves per address: 429 with Retry-After past 60 a minute; a signed-in caller is not limited', async () => {
    const address = `127.0.${1 + Math.floor(Math.random() * 250)}.${2 + Math.floor(Math.random() * 250)}`
    const statuses: number[] = []
    for (let i = 0; i < 60; i++) statuses.push((await solveFrom(address, example)).status)
    expect(statuses.every(s => s === 200)).toBe(true)
    const over = await solveFrom(address, example)
    expect(over.status).toBe(429)
    expect(Number(over.retryAfter)).toBeGreaterThan(0)
    expect(Number(over.retryAfter)).toBeLessThanOrEqual(60)
    expect(over.body.data.errors[0].path).toBe('(body)')
    const signedIn = await practitioner.call('/api/solve', { method: 'POST', json: example })
    expect(signedIn.status).toBe(200)
  })
})
