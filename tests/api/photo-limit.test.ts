// The 12-photo limit of a lab sheet holds under parallel uploads: the count is taken inside the
// insert's transaction with the sheet's row locked, so 30 at once leave exactly 12.
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { count, eq } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { labSheetPhotos, labSheets } from '../../server/db/schema'
import { PHOTOS_PER_SHEET } from '../../shared/schemas/lab-sheets'
import starter from '../../examples/one-unit-series.json'
import { databaseURL } from './helpers'
import { newPerson, type Person } from './people'

const db = createDB(databaseURL, { connectionLimit: 2 })
let student: Person
let sheetId = 0
let jpeg: Buffer

beforeAll(async () => {
  student = await newPerson('student', databaseURL, 'photo-burst')
  // the sheet is made in the database: what is under test is the upload, not the sheet's making
  const [row] = await db.insert(labSheets).values({ ownerId: student.id, title: 'Photo burst', document: starter as Record<string, unknown>, measured: {}, notes: '' }).$returningId()
  sheetId = row!.id
  jpeg = await sharp({ create: { width: 120, height: 90, channels: 3, background: '#8a4a29' } }).jpeg().toBuffer()
})

afterAll(async () => {
  await db.$client.end()
})

function upload(index: number) {
  const form = new FormData()
  form.append('caption', `burst ${index}`)
  form.append('photo', new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' }), `burst-${index}.jpg`)
  return student.call(`/api/lab-sheets/${sheetId}/photos`, { method: 'POST', body: form })
}

describe('photos per sheet', () => {
  it('30 parallel uploads leave exactly 12, the rest refused with 409', async () => {
    expect(PHOTOS_PER_SHEET).toBe(12)
    const answers = await Promise.all(Array.from({ length: 30 }, (_, i) => upload(i)))
    const statuses = answers.map(a => a.status)
    expect(statuses.filter(s => s === 201), answers.find(a => a.status !== 201 && a.status !== 409)?.text).toHaveLength(12)
    expect(statuses.filter(s => s === 409)).toHaveLength(18)
    const [{ n }] = await db.select({ n: count() }).from(labSheetPhotos).where(eq(labSheetPhotos.sheetId, sheetId)) as [{ n: number }]
    expect(Number(n)).toBe(12)
  })
})
