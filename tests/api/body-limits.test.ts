// Bodies are limited by their bytes as they arrive: a chunked body (no declared length) past
// a route's limit is refused with 413 once the limit is reached, the rest is never read, and
// the server's memory does not grow with what was sent. A server of this file's own, so its
// memory is measured with nothing else running on it.
import { join } from 'node:path'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import starter from '../../examples/one-unit-series.json'
import { api, databaseURL, scratchDir } from './helpers'
import { newPerson, type Person } from './people'
import { multipartAround, residentBytes, streamBody } from './raw-http'
import { startServer } from './servers'

const MB = 1024 * 1024
let server: Awaited<ReturnType<typeof startServer>>
let student: Person
let sheetId = 0

beforeAll(async () => {
  const port = await freePort()
  server = await startServer({
    port,
    env: {
      NUXT_DATABASE_URL: databaseURL,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!,
      NUXT_PUBLIC_BASE_URL: `http://127.0.0.1:${port}`,
      NUXT_UPLOADS_DIR: join(scratchDir, 'body-limit-uploads'),
    },
    logFile: join(scratchDir, 'body-limits-server.log'),
  })
  student = await newPerson('student', databaseURL, 'body-limits')
})
afterAll(async () => {
  await server?.stop()
})

const url = (path: string) => `${server.baseURL}${path}`
const json = { 'content-type': 'application/json' }
// signed in for /api/solve: anonymous solves are limited per address, and these are not tests of that
const solveHeaders = () => ({ ...json, cookie: student.cookie })

describe('JSON bodies by bytes', () => {
  it('refuses a chunked 50 MB body with 413, and the server\'s memory grows by less than 100 MB', async () => {
    const before = residentBytes(server.child.pid!)
    const r = await streamBody(url('/api/solve'), { headers: solveHeaders(), bytes: 50 * MB })
    expect(r.status, r.text).toBe(413)
    expect(r.body.data.errors[0]).toEqual({ path: '(body)', message: 'the body is larger than 256 KB' })
    expect(r.sent).toBeLessThan(50 * MB)
    const after = residentBytes(server.child.pid!)
    expect(after - before).toBeLessThan(100 * MB)
    expect((await api('/api/health', { base: server.baseURL })).status).toBe(200)
  })

  it('refuses four parallel chunked 50 MB bodies, memory still bounded', async () => {
    const before = residentBytes(server.child.pid!)
    const answers = await Promise.all(Array.from({ length: 4 }, () => streamBody(url('/api/solve'), { headers: solveHeaders(), bytes: 50 * MB })))
    expect(answers.map(a => a.status)).toEqual([413, 413, 413, 413])
    expect(residentBytes(server.child.pid!) - before).toBeLessThan(100 * MB)
  })

  it('answers a chunked 600 MB body with 413, not 500 (three times over: the answer always beats the close)', async () => {
    for (let i = 0; i < 3; i++) {
      const r = await streamBody(url('/api/solve'), { headers: solveHeaders(), bytes: 600 * MB })
      expect(r.status, r.text).toBe(413)
      expect(r.body.statusMessage).toBe('Body too large')
      expect(r.sent).toBeLessThan(100 * MB)
    }
  })

  it('refuses a declared 50 MB length before reading any of it', async () => {
    const r = await streamBody(url('/api/solve'), { headers: solveHeaders(), bytes: 50 * MB, declareLength: true })
    expect(r.status).toBe(413)
  })

  it('refuses a chunked oversize body on a signed-in write route too, and saves nothing', async () => {
    const before = (await student.call('/api/banks?q=chunked', { base: server.baseURL })).body.total
    const r = await streamBody(url('/api/banks'), { headers: { ...json, cookie: student.cookie }, bytes: 2 * MB, head: Buffer.from('{"name":"chunked","document":{"name":"') })
    expect(r.status, r.text).toBe(413)
    expect((await student.call('/api/banks?q=chunked', { base: server.baseURL })).body.total).toBe(before)
  })

  it('takes a chunked body under the limit whole', async () => {
    const body = Buffer.from(JSON.stringify({ name: 'chunked under the limit', document: starter }))
    const r = await streamBody(url('/api/banks'), { headers: { ...json, cookie: student.cookie }, bytes: body.length, head: body })
    expect(r.status, r.text).toBe(201)
  })
})

describe('photo uploads by bytes', () => {
  beforeAll(async () => {
    const made = await student.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240' }, base: server.baseURL })
    expect(made.status, made.text).toBe(201)
    sheetId = made.body.id
  })

  it('refuses a chunked upload past 8 MB with 413 naming the photo, and stores nothing', async () => {
    const { head, tail, contentType } = multipartAround('big.jpg', 'image/jpeg')
    const before = residentBytes(server.child.pid!)
    const r = await streamBody(url(`/api/lab-sheets/${sheetId}/photos`), { headers: { 'content-type': contentType, cookie: student.cookie }, bytes: 50 * MB, head, tail })
    expect(r.status, r.text).toBe(413)
    expect(r.body.data.errors[0].path).toBe('photo')
    expect(r.body.data.errors[0].message).toMatch(/larger than 8\.0 MB/)
    expect(residentBytes(server.child.pid!) - before).toBeLessThan(100 * MB)
    expect((await student.call(`/api/lab-sheets/${sheetId}`, { base: server.baseURL })).body.photos).toEqual([])
  })

  it('takes a chunked upload under the limit', async () => {
    const jpeg = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#8a4a29' } }).jpeg().toBuffer()
    const { head, tail, contentType } = multipartAround('bench.jpg', 'image/jpeg', 'chunked')
    const body = Buffer.concat([head, jpeg, tail])
    const r = await streamBody(url(`/api/lab-sheets/${sheetId}/photos`), { headers: { 'content-type': contentType, cookie: student.cookie }, bytes: body.length, head: body })
    expect(r.status, r.text).toBe(201)
    expect(r.body.caption).toBe('chunked')
  })
})
