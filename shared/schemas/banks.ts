/** Request bodies and queries of the saved-banks routes. */
import { z } from 'zod'
import { CircuitSchema } from '../circuit/parse'

export const BANK_NAME_MAX = 120

/** What a saved bank is: one drawn on the Bench, or a Site check (shown as "site check" in My banks). */
export const BANK_KINDS = ['bank', 'site-check'] as const
export type BankKind = (typeof BANK_KINDS)[number]
const bankName = z.string({ error: 'name is required' }).trim().min(1, { error: 'give the bank a name' }).max(BANK_NAME_MAX, { error: `name is too long (${BANK_NAME_MAX} characters at most)` })
const version = z.number({ error: 'version is required: send the version you loaded' }).int({ error: 'version must be a whole number' }).positive({ error: 'version must be a whole number' })

export const BankCreateSchema = z.object({ name: bankName, document: CircuitSchema })
export const BankPatchSchema = z
  .object({ name: bankName.optional(), document: CircuitSchema.optional(), version })
  .refine((b) => b.name !== undefined || b.document !== undefined, { error: 'nothing to change: send name or document' })
export const BankListQuerySchema = z.object({
  q: z.string().trim().max(120).optional(),
  sort: z.enum(['updated', 'name', 'created']).default('updated'),
  order: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
  deleted: z.enum(['0', '1']).default('0'),
})

/** One row of "My banks". */
export interface BankSummary {
  id: number
  name: string
  kind: BankKind
  version: number
  createdAt: string
  updatedAt: string
  deletedAt: string | null
  shared: boolean
  /** The read-only link when the bank is shared. */
  shareUrl: string | null
}
export interface Paged<T> {
  items: T[]
  total: number
  page: number
  pageSize: number
}
