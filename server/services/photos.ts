/**
 * Lab-sheet photos. The type is read from the bytes (file-type), never from the name or the
 * declared type; the image is decoded and re-encoded by sharp (which drops every bit of
 * metadata: location, camera, time), with a thumbnail; only then is anything stored.
 */
import { randomUUID } from 'node:crypto'
import type { H3Event } from 'h3'
import { fileTypeFromBuffer } from 'file-type'
import sharp from 'sharp'
import { and, count, eq, inArray } from 'drizzle-orm'
import { PHOTO_LIMIT_BYTES, PHOTOS_PER_SHEET } from '#shared/schemas/lab-sheets'
import type { User } from '../db/schema'
import { readableSheet, writableSheet, photoUrl } from './lab-sheets'

const { labSheetPhotos, labSheets } = tables
const ACCEPTED = new Set(['image/jpeg', 'image/png', 'image/webp'])
// multipart framing and the caption on top of the file itself
const FORM_OVERHEAD = 64 * 1024

function refused(status: number, message: string, statusMessage = 'Photo refused') {
  return createError({ statusCode: status, statusMessage, data: { errors: [{ path: 'photo', message }] } })
}

const megabytes = (n: number) => `${(n / 1024 / 1024).toFixed(n < 1024 * 1024 ? 2 : 1)} MB`

export async function addPhoto(event: H3Event, owner: User, sheetId: number) {
  const sheet = await writableSheet(owner, sheetId)
  const declared = Number(getRequestHeader(event, 'content-length') ?? Number.NaN)
  if (!Number.isFinite(declared)) throw refused(411, 'send the photo with its length (an ordinary form upload does)', 'Length required')
  if (declared > PHOTO_LIMIT_BYTES + FORM_OVERHEAD) throw refused(413, `the photo is larger than ${megabytes(PHOTO_LIMIT_BYTES)}: take it at a lower resolution`, 'Photo too large')
  const [{ n }] = await useDB().select({ n: count() }).from(labSheetPhotos).where(eq(labSheetPhotos.sheetId, sheet.id)) as [{ n: number }]
  if (Number(n) >= PHOTOS_PER_SHEET) throw refused(409, `a sheet holds ${PHOTOS_PER_SHEET} photos at most: remove one first`)

  const parts = await readMultipartFormData(event).catch(() => null)
  const file = parts?.find(p => p.name === 'photo' && p.filename !== undefined)
  if (!file || file.data.length === 0) throw refused(400, 'choose a photo to upload (the form field is "photo")', 'No photo')
  if (file.data.length > PHOTO_LIMIT_BYTES) throw refused(413, `the photo is larger than ${megabytes(PHOTO_LIMIT_BYTES)}: take it at a lower resolution`, 'Photo too large')
  const caption = (parts?.find(p => p.name === 'caption')?.data.toString('utf8') ?? '').trim().slice(0, 200)

  const kind = await fileTypeFromBuffer(file.data)
  if (!kind || !ACCEPTED.has(kind.mime)) {
    throw refused(415, `${file.filename || 'the file'} is not a JPEG, PNG or WebP image${kind ? ` (its bytes say ${kind.mime})` : ''}`, 'Not a photo')
  }
  let full: { data: Buffer, info: { width: number, height: number } }
  let thumb: Buffer
  try {
    // failOn 'truncated': a cut-off file is refused rather than stored half grey
    const image = sharp(file.data, { failOn: 'truncated', limitInputPixels: 50_000_000 }).rotate()
    full = await image.clone().resize({ width: 2400, height: 2400, fit: 'inside', withoutEnlargement: true }).webp({ quality: 82 }).toBuffer({ resolveWithObject: true })
    thumb = await image.clone().resize({ width: 320, height: 320, fit: 'inside', withoutEnlargement: true }).webp({ quality: 70 }).toBuffer()
  }
  catch {
    throw refused(422, `${file.filename || 'the photo'} is damaged or cut short: it could not be read as a whole image`, 'Damaged photo')
  }

  const base = `sheets/${sheet.id}/${randomUUID()}`
  const storage = useStorage('uploads')
  await storage.setItemRaw(`${base}.webp`, full.data)
  await storage.setItemRaw(`${base}-thumb.webp`, thumb)
  try {
    const row = await useDB().transaction(async (tx) => {
      // the sheet's row locked, then counted: parallel uploads to one sheet take turns here,
      // so the limit holds however many arrive at once (the count above only saves the work)
      const [locked] = await tx.select({ id: labSheets.id }).from(labSheets)
        .where(and(eq(labSheets.id, sheet.id), eq(labSheets.ownerId, owner.id), inArray(labSheets.status, ['draft', 'redo'])))
        .for('update')
      if (!locked) throw createError({ statusCode: 409, statusMessage: 'This sheet was handed in meanwhile: it is read-only until it is reviewed' })
      const [{ n: held }] = await tx.select({ n: count() }).from(labSheetPhotos).where(eq(labSheetPhotos.sheetId, sheet.id)) as [{ n: number }]
      if (Number(held) >= PHOTOS_PER_SHEET) throw refused(409, `a sheet holds ${PHOTOS_PER_SHEET} photos at most: remove one first`)
      const [inserted] = await tx.insert(labSheetPhotos).values({
        sheetId: sheet.id, storageKey: `${base}.webp`, thumbKey: `${base}-thumb.webp`,
        width: full.info.width, height: full.info.height, bytes: full.data.length, caption,
      }).$returningId()
      return inserted
    })
    return { id: row!.id, caption, width: full.info.width, height: full.info.height, bytes: full.data.length, url: photoUrl(sheet.id, row!.id), thumbUrl: photoUrl(sheet.id, row!.id, true) }
  }
  catch (error) {
    // nothing half-written: the files go if the row could not be made
    await storage.removeItem(`${base}.webp`)
    await storage.removeItem(`${base}-thumb.webp`)
    throw error
  }
}

async function photoOf(sheetId: number, photoId: number) {
  const [photo] = await useDB().select().from(labSheetPhotos).where(and(eq(labSheetPhotos.id, photoId), eq(labSheetPhotos.sheetId, sheetId)))
  if (!photo) throw createError({ statusCode: 404, statusMessage: 'No such photo' })
  return photo
}

/** The photo's bytes, for the sheet's owner or its class instructor only. */
export async function readPhoto(event: H3Event, user: User, sheetId: number, photoId: number, thumb: boolean) {
  await readableSheet(user, sheetId)
  const photo = await photoOf(sheetId, photoId)
  const data = await useStorage('uploads').getItemRaw<Buffer>(thumb ? photo.thumbKey : photo.storageKey)
  if (!data) throw createError({ statusCode: 404, statusMessage: 'The photo file is missing' })
  setResponseHeaders(event, {
    'Content-Type': 'image/webp',
    'Cache-Control': 'private, max-age=300',
    'X-Content-Type-Options': 'nosniff',
    'Content-Disposition': 'inline',
  })
  return Buffer.isBuffer(data) ? data : Buffer.from(data as Uint8Array)
}

export async function removePhoto(owner: User, sheetId: number, photoId: number) {
  await writableSheet(owner, sheetId)
  const photo = await photoOf(sheetId, photoId)
  await useDB().delete(labSheetPhotos).where(eq(labSheetPhotos.id, photo.id))
  const storage = useStorage('uploads')
  await storage.removeItem(photo.storageKey)
  await storage.removeItem(photo.thumbKey)
}
