/** Request bodies of the lab-sheet routes; the sheet form checks with the same schemas. */
import { z } from 'zod'
import { parseReading } from '../lab-sheets/compare'
import { idField, idParam } from './ids'

export const LAB_SHEET_STATUS = ['draft', 'submitted', 'accepted', 'redo'] as const
export type LabSheetStatus = (typeof LAB_SHEET_STATUS)[number]
export const PHOTO_LIMIT_BYTES = 8 * 1024 * 1024
export const PHOTOS_PER_SHEET = 12

const id = (what: string) => idField(what)
const title = z.string({ error: 'title must be text' }).trim().min(1, { error: 'give the sheet a title' }).max(120, { error: 'title is too long (120 characters at most)' })
const volts = (what: string) => z.number({ error: `${what} must be a number of volts` }).gte(0, { error: `${what} cannot be negative` }).lte(1_000_000, { error: `${what} is too high` })

/** A measured value: a number, or text such as "239,8" (a comma or a point), or null for not taken. */
export const ReadingSchema = z.union([z.number(), z.string().max(24), z.null()], { error: 'a reading is a number of volts, such as 239.8' })
  .transform((v, ctx) => {
    const n = typeof v === 'string' ? parseReading(v) : v
    if (n !== null && (!Number.isFinite(n) || n < 0 || n > 1_000_000)) {
      ctx.addIssue({ code: 'custom', message: 'a reading is a number of volts, such as 239.8 or 239,8' })
      return z.NEVER
    }
    return n
  })

export const LabSheetCreateSchema = z.object({
  bankId: id('bankId').optional(),
  starter: z.string({ error: 'starter is a starter slug' }).max(80).regex(/^[a-z0-9-]+$/, { error: 'starter is a starter slug' }).optional(),
  title: title.optional(),
  classId: id('classId').optional(),
}).refine(b => (b.bankId === undefined) !== (b.starter === undefined), { error: 'start from one of your banks (bankId) or a starter (starter)' })

export const LabSheetPatchSchema = z.object({
  version: z.number({ error: 'version is required: send the version you loaded' }).int().positive(),
  title: title.optional(),
  measured: z.record(z.string().max(200), ReadingSchema, { error: 'measured maps test points to readings' }).optional(),
  supplyVolts: volts('supplyVolts').nullable().optional(),
  rescale: z.boolean({ error: 'rescale is true or false' }).optional(),
  notes: z.string({ error: 'notes must be text' }).max(4000, { error: 'notes are too long (4000 characters at most)' }).optional(),
  classId: id('classId').nullable().optional(),
})
export const LabSheetSubmitSchema = z.object({ classId: id('classId').optional() })
export const LabSheetReviewSchema = z.object({
  verdict: z.enum(['accepted', 'redo'], { error: 'verdict is accepted or redo' }),
  comment: z.string({ error: 'comment must be text' }).trim().max(2000, { error: 'comment is too long (2000 characters at most)' }).default(''),
}).refine(b => b.verdict !== 'redo' || b.comment.length > 0, { error: 'say what to redo', path: ['comment'] })
export const LabSheetListQuerySchema = z.object({
  classId: idParam('classId', 'classId must be an id').optional(),
  status: z.enum(LAB_SHEET_STATUS, { error: `status is one of ${LAB_SHEET_STATUS.join(', ')}` }).optional(),
})
export const photoParams = z.object({
  id: idParam('id'),
  photoId: idParam('photoId'),
})
