// Lab sheets against the built server: a student fills a sheet (comma decimals, measured
// supply), uploads photos (and bad files are refused with nothing stored), hands it in; the
// instructor of that class reads it, sends it back, accepts it; nobody else sees any of it.
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import sharp from 'sharp'
import { beforeAll, describe, expect, it } from 'vitest'
import { databaseURL } from './helpers'
import { mailTo, newPerson, type Person } from './people'

const uploadsDir = process.env.PHASELOOM_UPLOADS_DIR ?? ''

let student: Person
let outsider: Person
let instructor: Person
let rival: Person
let classId = 0
let sheet: any

function storedFiles(): string[] {
  const walk = (dir: string): string[] => {
    try {
      return readdirSync(dir).flatMap(name => (statSync(join(dir, name)).isDirectory() ? walk(join(dir, name)) : [join(dir, name)]))
    }
    catch {
      return []
    }
  }
  return walk(uploadsDir)
}

function upload(person: Person, id: number, data: Buffer, filename: string, type: string, caption = '') {
  const form = new FormData()
  form.append('caption', caption)
  form.append('photo', new Blob([new Uint8Array(data)], { type }), filename)
  return person.call(`/api/lab-sheets/${id}/photos`, { method: 'POST', body: form })
}

const point = (kind: string) => sheet.comparison.rows.find((r: any) => r.point.kind === kind)

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'sheet-student')
  outsider = await newPerson('student', databaseURL, 'sheet-outsider')
  instructor = await newPerson('instructor', databaseURL, 'sheet-teacher')
  rival = await newPerson('instructor', databaseURL, 'sheet-rival')
  const klass = await instructor.call('/api/classes', { method: 'POST', json: { name: 'Sheet class', tolerancePercent: 3 } })
  classId = klass.body.id
  await student.call('/api/classes/join', { method: 'POST', json: { code: klass.body.joinCode } })
})

describe('a lab sheet', () => {
  it('is made from a starter with the readings to take, in order, and the class tolerance', async () => {
    const made = await student.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240', classId } })
    expect(made.status, made.text).toBe(201)
    sheet = made.body
    expect(sheet.status).toBe('draft')
    expect(sheet.comparison.tolerancePercent).toBe(3)
    expect(sheet.comparison.rows.map((r: any) => r.point.kind).slice(0, 4)).toEqual(['primary', 'primary', 'primary', 'closing-check'])
    expect(sheet.comparison.rows.every((r: any) => r.status === 'not-taken')).toBe(true)
    const notMine = await outsider.call('/api/lab-sheets', { method: 'POST', json: { starter: 'closed-delta-240', classId } })
    expect(notMine.status).toBe(400)
    expect(notMine.body.data.errors).toEqual([{ path: 'classId', message: 'you are not in that class' }])
  })

  it('takes readings with a comma or a point, and compares them', async () => {
    const line = point('line-line').point.id
    const check = point('closing-check').point.id
    const saved = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: sheet.version, measured: { [line]: '239,8', [check]: 478 }, notes: 'Bench 3' } })
    expect(saved.status, saved.text).toBe(200)
    sheet = saved.body
    expect(sheet.measured[line]).toBe(239.8)
    expect(point('line-line')).toMatchObject({ measuredVolts: 239.8, status: 'ok' })
    // common practice: ≈ 2 × coil voltage across the open corner means one unit is reversed
    expect(point('closing-check').status).toBe('miss')
    expect(point('closing-check').cause).toMatch(/one unit is connected backwards/)
  })

  it('rescales the prediction to the measured supply', async () => {
    const line = point('line-line').point.id
    const low = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: sheet.version, measured: { [line]: 228 } } })
    expect(low.body.comparison.rows.find((r: any) => r.point.id === line).status).toBe('miss')
    const scaled = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: low.body.version, supplyVolts: 456, rescale: true } })
    sheet = scaled.body
    expect(sheet.comparison.scale).toBeCloseTo(0.95, 6)
    expect(sheet.comparison.rows.find((r: any) => r.point.id === line).status).toBe('ok')
  })

  it('names what is wrong in a bad change, and refuses a stale one', async () => {
    const unknown = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: sheet.version, measured: { 'line-line:Q.a:Q.b': 1 } } })
    expect(unknown.status).toBe(400)
    expect(unknown.body.data.errors).toEqual([{ path: 'measured["line-line:Q.a:Q.b"]', message: 'this sheet has no such test point' }])
    const words = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: sheet.version, measured: { [point('coil').point.id]: 'about 120' } } })
    expect(words.status).toBe(400)
    expect(words.body.data.errors[0].path).toMatch(/^measured\./)
    const stale = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: sheet.version - 1, notes: 'late' } })
    expect(stale.status).toBe(409)
  })
})

describe('photos', () => {
  let photoId = 0

  it('re-encodes an upload and drops its metadata', async () => {
    const jpeg = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#8a4a29' } })
      .withExif({ IFD0: { Artist: 'Somebody', Copyright: 'secret location' } }).jpeg().toBuffer()
    expect((await sharp(jpeg).metadata()).exif).toBeDefined()
    const before = storedFiles().length
    const r = await upload(student, sheet.id, jpeg, 'bench.jpg', 'image/jpeg', 'Bench 3 wired')
    expect(r.status, r.text).toBe(201)
    photoId = r.body.id
    expect(storedFiles().length).toBe(before + 2)
    const image = await student.call(r.body.url)
    expect(image.status).toBe(200)
    expect(image.headers.get('content-type')).toBe('image/webp')
    const stored = readFileSync(storedFiles().find(f => !f.endsWith('-thumb.webp') && f.includes(`sheets/${sheet.id}/`))!)
    const meta = await sharp(stored).metadata()
    expect(meta.format).toBe('webp')
    expect(meta.exif).toBeUndefined()
    expect(stored.includes(Buffer.from('secret location'))).toBe(false)
    const thumb = await sharp(readFileSync(storedFiles().find(f => f.endsWith('-thumb.webp'))!)).metadata()
    expect(Math.max(thumb.width!, thumb.height!)).toBeLessThanOrEqual(320)
  })

  it.each([
    ['a renamed executable', () => readFileSync('/bin/true'), 'photo.jpg', 'image/jpeg', 415, /is not a JPEG, PNG or WebP image/],
    ['a text file named .png', () => Buffer.from('just some words, not an image at all'), 'notes.png', 'image/png', 415, /is not a JPEG, PNG or WebP image/],
    ['an oversize file', () => Buffer.alloc(9 * 1024 * 1024, 0xFF), 'huge.jpg', 'image/jpeg', 413, /larger than 8\.0 MB/],
  ])('refuses %s with a clear message and stores nothing', async (_, data, name, type, status, message) => {
    const before = storedFiles()
    const r = await upload(student, sheet.id, data(), name, type)
    expect(r.status, r.text).toBe(status)
    expect(r.body.data.errors[0].path).toBe('photo')
    expect(r.body.data.errors[0].message).toMatch(message)
    expect(storedFiles()).toEqual(before)
  })

  it('refuses a truncated image and stores nothing', async () => {
    const whole = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#336699' } }).jpeg({ quality: 95 }).toBuffer()
    const before = storedFiles()
    const r = await upload(student, sheet.id, whole.subarray(0, Math.floor(whole.length / 2)), 'cut.jpg', 'image/jpeg')
    expect(r.status, r.text).toBe(422)
    expect(r.body.data.errors[0].message).toMatch(/damaged or cut short/)
    expect(storedFiles()).toEqual(before)
    const view = await student.call(`/api/lab-sheets/${sheet.id}`)
    expect(view.body.photos.map((p: any) => p.id)).toEqual([photoId])
  })

  it('shows a photo to its owner only while the sheet is a draft', async () => {
    const url = `/api/lab-sheets/${sheet.id}/photos/${photoId}`
    expect((await outsider.call(url)).status).toBe(404)
    expect((await instructor.call(url)).status).toBe(404)
    expect((await outsider.call(`/api/lab-sheets/${sheet.id}`)).status).toBe(404)
    expect((await instructor.call(`/api/lab-sheets/${sheet.id}`)).status).toBe(404)
  })
})

describe('handing in and review', () => {
  it('hands the sheet in; the class instructor sees it, others do not', async () => {
    const done = await student.call(`/api/lab-sheets/${sheet.id}/submit`, { method: 'POST', json: {} })
    expect(done.status, done.text).toBe(200)
    expect(done.body.status).toBe('submitted')
    expect((await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: done.body.version, notes: 'x' } })).status).toBe(409)
    const list = await instructor.call(`/api/lab-sheets?classId=${classId}&status=submitted`)
    expect(list.body.map((s: any) => s.id)).toContain(sheet.id)
    expect((await rival.call(`/api/lab-sheets?classId=${classId}`)).status).toBe(404)
    const seen = await instructor.call(`/api/lab-sheets/${sheet.id}`)
    expect(seen.status).toBe(200)
    expect(seen.body.as).toBe('instructor')
    expect((await instructor.call(seen.body.photos[0].thumbUrl)).status).toBe(200)
    expect((await rival.call(`/api/lab-sheets/${sheet.id}`)).status).toBe(404)
    expect((await rival.call(seen.body.photos[0].url)).status).toBe(404)
  })

  it('sends it back with a comment (mailed), then accepts the second go', async () => {
    const bare = await instructor.call(`/api/lab-sheets/${sheet.id}/review`, { method: 'POST', json: { verdict: 'redo' } })
    expect(bare.status).toBe(400)
    expect(bare.body.data.errors[0].path).toBe('comment')
    const redo = await instructor.call(`/api/lab-sheets/${sheet.id}/review`, { method: 'POST', json: { verdict: 'redo', comment: 'Retake the closing check with T2 turned round.' } })
    expect(redo.status, redo.text).toBe(200)
    const mail = await mailTo(student.email)
    expect(mail.subject).toBe(`Lab sheet to redo: ${sheet.title}`)
    expect(mail.text).toContain('Retake the closing check')
    const mine = await student.call(`/api/lab-sheets/${sheet.id}`)
    const fixed = await student.call(`/api/lab-sheets/${sheet.id}`, { method: 'PATCH', json: { version: mine.body.version, measured: { [point('closing-check').point.id]: 0.6 } } })
    expect(fixed.status).toBe(200)
    expect(fixed.body.comparison.rows.find((r: any) => r.point.kind === 'closing-check').status).toBe('ok')
    expect((await student.call(`/api/lab-sheets/${sheet.id}/submit`, { method: 'POST', json: {} })).status).toBe(200)
    const accepted = await instructor.call(`/api/lab-sheets/${sheet.id}/review`, { method: 'POST', json: { verdict: 'accepted' } })
    expect(accepted.body.status).toBe('accepted')
    expect((await student.call(`/api/lab-sheets/${sheet.id}/review`, { method: 'POST', json: { verdict: 'accepted' } })).status).toBe(403)
  })

  it('exports the sheet as CSV, one row per test point', async () => {
    const csv = await student.call(`/api/lab-sheets/${sheet.id}?format=csv`)
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toContain('text/csv')
    const lines = csv.text.trim().split('\r\n')
    expect(lines[0]).toBe('step,reading,from,to,expected_volts,measured_volts,deviation_percent,status,likely_cause')
    expect(lines).toHaveLength(1 + sheet.comparison.rows.length)
    expect(lines.some(l => l.includes('Closing check') && l.includes(',ok,'))).toBe(true)
  })

  it('lists the student\'s own sheets', async () => {
    const list = await student.call('/api/lab-sheets')
    expect(list.body.find((s: any) => s.id === sheet.id)).toMatchObject({ status: 'accepted', points: sheet.comparison.rows.length })
    expect((await outsider.call('/api/lab-sheets')).body.map((s: any) => s.id)).not.toContain(sheet.id)
  })
})
