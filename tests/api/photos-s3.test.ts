// The photo routes against both storage drivers, with the same checks: the file driver of the
// run's server, and the S3 driver of a second server pointed at a local S3-compatible fake
// (s3rver, started here), where each object is looked for in the fake's bucket through its API.
import { mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { AwsClient } from 'aws4fetch'
import S3rver from 's3rver'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { freePort } from '../../scripts/db.mjs'
import { baseURL, databaseURL, scratchDir } from './helpers'
import { newPerson, type Person } from './people'
import { startServer } from './servers'

const BUCKET = 'phaseloom-photos'
const S3_KEY = 'S3RVER' // s3rver's own development credentials
const s3client = new AwsClient({ service: 's3', accessKeyId: S3_KEY, secretAccessKey: S3_KEY, region: 'us-east-1' })

let fake: { run: () => Promise<{ port: number }>, close: () => Promise<void> } | undefined
let s3Endpoint = ''
let s3Server: Awaited<ReturnType<typeof startServer>> | undefined

beforeAll(async () => {
  fake = new S3rver({ address: '127.0.0.1', port: await freePort(), directory: mkdtempSync(join(scratchDir, 's3-')), silent: true, configureBuckets: [{ name: BUCKET }] })
  s3Endpoint = `http://127.0.0.1:${(await fake!.run()).port}`
  const port = await freePort()
  s3Server = await startServer({
    port,
    env: {
      NUXT_DATABASE_URL: databaseURL,
      NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD!,
      NUXT_PUBLIC_BASE_URL: `http://127.0.0.1:${port}`,
      NUXT_UPLOADS_DRIVER: 's3',
      NUXT_UPLOADS_S3_BUCKET: BUCKET,
      NUXT_UPLOADS_S3_ENDPOINT: s3Endpoint,
      NUXT_UPLOADS_S3_REGION: 'us-east-1',
      NUXT_UPLOADS_S3_ACCESS_KEY_ID: S3_KEY,
      NUXT_UPLOADS_S3_SECRET_ACCESS_KEY: S3_KEY,
    },
    logFile: join(scratchDir, 's3-server.log'),
  })
})
afterAll(async () => {
  await s3Server?.stop()
  await fake?.close()
})

/** What a storage holds: its keys (as `sheets/ID/NAME.webp`) and the bytes of one. */
interface Store {
  keys(prefix: string): Promise<string[]>
  bytes(key: string): Promise<Buffer>
}

const fileStore = (dir: string): Store => {
  const walk = (at: string): string[] => {
    try {
      return readdirSync(at).flatMap(name => (statSync(join(at, name)).isDirectory() ? walk(join(at, name)) : [join(at, name)]))
    }
    catch {
      return []
    }
  }
  return {
    keys: async prefix => walk(dir).map(f => relative(dir, f)).filter(k => k.startsWith(prefix)).sort(),
    bytes: async key => readFileSync(join(dir, key)),
  }
}

const bucketStore: Store = {
  async keys(prefix) {
    const r = await fetch(await s3client.sign(`${s3Endpoint}/${BUCKET}?prefix=${encodeURIComponent(prefix)}`))
    expect(r.status).toBe(200)
    return [...(await r.text()).matchAll(/<Key>([^<]+)<\/Key>/g)].map(m => m[1]!).sort()
  },
  async bytes(key) {
    const r = await fetch(await s3client.sign(`${s3Endpoint}/${BUCKET}/${key}`))
    expect(r.status).toBe(200)
    return Buffer.from(await r.arrayBuffer())
  },
}

describe.each([
  { driver: 'the file driver', base: () => baseURL, store: () => fileStore(process.env.PHASELOOM_UPLOADS_DIR!) },
  { driver: 'the S3 driver on the fake', base: () => s3Server!.baseURL, store: () => bucketStore },
])('photos on $driver', ({ driver, base, store }) => {
  let student: Person
  let outsider: Person
  let sheetId = 0
  let photo: { id: number, url: string, thumbUrl: string }
  const prefix = () => `sheets/${sheetId}/`
  const on = (person: Person, path: string, init: Parameters<Person['call']>[1] = {}) => person.call(path, { ...init, base: base() })
  const upload = (data: Buffer, filename: string, type: string, caption = '') => {
    const form = new FormData()
    form.append('caption', caption)
    form.append('photo', new Blob([new Uint8Array(data)], { type }), filename)
    return on(student, `/api/lab-sheets/${sheetId}/photos`, { method: 'POST', body: form })
  }

  beforeAll(async () => {
    const tag = driver.includes('S3') ? 's3' : 'fs'
    student = await newPerson('student', databaseURL, `photos-${tag}`)
    outsider = await newPerson('student', databaseURL, `photos-${tag}-outsider`)
    const made = await on(student, '/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240' } })
    expect(made.status, made.text).toBe(201)
    sheetId = made.body.id
  })

  it('stores a re-encoded photo and its thumbnail, without the metadata', async () => {
    const jpeg = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#8a4a29' } })
      .withExif({ IFD0: { Artist: 'Somebody', Copyright: 'secret location' } }).jpeg().toBuffer()
    const r = await upload(jpeg, 'bench.jpg', 'image/jpeg', 'Bench 3 wired')
    expect(r.status, r.text).toBe(201)
    photo = r.body
    const keys = await store().keys(prefix())
    expect(keys).toHaveLength(2)
    const full = await store().bytes(keys.find(k => !k.endsWith('-thumb.webp'))!)
    const meta = await sharp(full).metadata()
    expect(meta.format).toBe('webp')
    expect(meta.exif).toBeUndefined()
    expect(full.includes(Buffer.from('secret location'))).toBe(false)
    const thumb = await sharp(await store().bytes(keys.find(k => k.endsWith('-thumb.webp'))!)).metadata()
    expect(Math.max(thumb.width!, thumb.height!)).toBeLessThanOrEqual(320)
  })

  it('hands the stored bytes back to the owner, the full image and the thumbnail', async () => {
    const keys = await store().keys(prefix())
    const image = await on(student, photo.url)
    expect(image.status).toBe(200)
    expect(image.headers.get('content-type')).toBe('image/webp')
    const got = Buffer.from(await (await fetch(new URL(photo.url, base()), { headers: { cookie: student.cookie } })).arrayBuffer())
    expect(got.equals(await store().bytes(keys.find(k => !k.endsWith('-thumb.webp'))!))).toBe(true)
    expect((await on(student, photo.thumbUrl)).status).toBe(200)
    expect((await on(outsider, photo.url)).status).toBe(404)
  })

  it.each([
    ['a text file named .png', () => Buffer.from('just some words, not an image at all'), 'notes.png', 'image/png', 415],
    ['an oversize file', () => Buffer.alloc(9 * 1024 * 1024, 0xFF), 'huge.jpg', 'image/jpeg', 413],
  ])('refuses %s and stores nothing', async (_, data, name, type, status) => {
    const before = await store().keys(prefix())
    const r = await upload(data(), name, type)
    expect(r.status, r.text).toBe(status)
    expect(r.body.data.errors[0].path).toBe('photo')
    expect(await store().keys(prefix())).toEqual(before)
  })

  it('refuses a truncated image and stores nothing', async () => {
    const whole = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#336699' } }).jpeg({ quality: 95 }).toBuffer()
    const before = await store().keys(prefix())
    const r = await upload(whole.subarray(0, Math.floor(whole.length / 2)), 'cut.jpg', 'image/jpeg')
    expect(r.status, r.text).toBe(422)
    expect(await store().keys(prefix())).toEqual(before)
  })

  it('deletes the photo: the objects leave the store and the address answers 404', async () => {
    expect((await on(outsider, `/api/lab-sheets/${sheetId}/photos/${photo.id}`, { method: 'DELETE' })).status).toBe(404)
    expect(await store().keys(prefix())).toHaveLength(2)
    const r = await on(student, `/api/lab-sheets/${sheetId}/photos/${photo.id}`, { method: 'DELETE' })
    expect(r.status, r.text).toBe(204)
    expect(await store().keys(prefix())).toEqual([])
    expect((await on(student, photo.url)).status).toBe(404)
    expect((await on(student, `/api/lab-sheets/${sheetId}`)).body.photos).toEqual([])
  })
})
