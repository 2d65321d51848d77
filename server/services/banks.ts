/** Saved banks: every query names the owner in its WHERE clause. */
import { and, asc, count, desc, eq, gt, isNotNull, isNull, like, sql } from 'drizzle-orm'
import type { z } from 'zod'
import type { BankKind, BankListQuerySchema, BankSummary, Paged } from '#shared/schemas/banks'
import { BANK_NAME_MAX } from '#shared/schemas/banks'
import type { Bank, User } from '../db/schema'

/** How long a deleted bank can be restored. */
export const RESTORE_DAYS = 30

type ListQuery = z.output<typeof BankListQuerySchema>

const { banks } = tables

function restorableSince(): Date {
  return new Date(Date.now() - RESTORE_DAYS * 86400_000)
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, c => `\\${c}`)
}

export function shareUrlOf(token: string): string {
  return publicUrl(`/shared/${token}`)
}

function summary(bank: Pick<Bank, 'id' | 'name' | 'kind' | 'version' | 'createdAt' | 'updatedAt' | 'deletedAt' | 'shareToken'>): BankSummary {
  return {
    id: bank.id,
    name: bank.name,
    kind: bank.kind,
    version: bank.version,
    createdAt: bank.createdAt.toISOString(),
    updatedAt: bank.updatedAt.toISOString(),
    deletedAt: bank.deletedAt?.toISOString() ?? null,
    shared: bank.shareToken !== null,
    shareUrl: bank.shareToken ? shareUrlOf(bank.shareToken) : null,
  }
}

export async function listBanks(owner: User, query: ListQuery): Promise<Paged<BankSummary>> {
  const where = and(
    eq(banks.ownerId, owner.id),
    query.deleted === '1' ? and(isNotNull(banks.deletedAt), gt(banks.deletedAt, restorableSince())) : isNull(banks.deletedAt),
    query.q ? like(banks.name, `%${escapeLike(query.q)}%`) : undefined,
  )
  const column = query.deleted === '1' && query.sort === 'updated'
    ? banks.deletedAt
    : { updated: banks.updatedAt, name: banks.name, created: banks.createdAt }[query.sort]
  const direction = query.order === 'asc' ? asc : desc
  const db = useDB()
  const [rows, [total]] = await Promise.all([
    db.select({
      id: banks.id, name: banks.name, kind: banks.kind, version: banks.version, createdAt: banks.createdAt,
      updatedAt: banks.updatedAt, deletedAt: banks.deletedAt, shareToken: banks.shareToken,
    }).from(banks).where(where)
      .orderBy(direction(column), direction(banks.id))
      .limit(query.pageSize).offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(banks).where(where),
  ])
  return { items: rows.map(summary), total: Number(total?.n ?? 0), page: query.page, pageSize: query.pageSize }
}

export function bankDetail(bank: Bank) {
  return {
    id: bank.id,
    name: bank.name,
    kind: bank.kind,
    document: bank.document,
    version: bank.version,
    createdAt: bank.createdAt.toISOString(),
    updatedAt: bank.updatedAt.toISOString(),
  }
}

export async function createBank(owner: User, name: string, document: Record<string, unknown>, kind: BankKind = 'bank') {
  const [row] = await useDB().insert(banks).values({ ownerId: owner.id, name, document, kind }).$returningId()
  return { id: row!.id, version: 1 }
}

/**
 * Saves a change only if `version` is still the stored one: the version check, the owner and
 * the not-deleted test are all in the UPDATE's WHERE, so two saves cannot both win.
 * 409 with the current version when it is stale; nothing is overwritten then.
 */
export async function updateBank(owner: User, id: number, change: { name?: string, document?: Record<string, unknown>, version: number }) {
  const db = useDB()
  const set: Partial<typeof banks.$inferInsert> = { version: sql`${banks.version} + 1` as never, updatedAt: new Date() }
  if (change.name !== undefined) set.name = change.name
  if (change.document !== undefined) set.document = change.document
  const [result] = await db.update(banks).set(set).where(and(
    eq(banks.id, id),
    eq(banks.ownerId, owner.id),
    isNull(banks.deletedAt),
    eq(banks.version, change.version),
  ))
  if (result.affectedRows === 1) return { id, version: change.version + 1 }
  const current = await requireBankOwner(owner, id)
  throw createError({
    statusCode: 409,
    statusMessage: 'The bank was saved elsewhere since you loaded it',
    data: {
      currentVersion: current.version,
      errors: [{ path: 'version', message: `version ${change.version} is not the current one (${current.version}): reload it, or save your work as a copy` }],
    },
  })
}

export async function softDeleteBank(owner: User, id: number) {
  const [result] = await useDB().update(banks).set({ deletedAt: new Date() })
    .where(and(eq(banks.id, id), eq(banks.ownerId, owner.id), isNull(banks.deletedAt)))
  if (result.affectedRows !== 1) throw bankNotFound()
}

export async function restoreBank(owner: User, id: number) {
  const [result] = await useDB().update(banks).set({ deletedAt: null })
    .where(and(eq(banks.id, id), eq(banks.ownerId, owner.id), isNotNull(banks.deletedAt), gt(banks.deletedAt, restorableSince())))
  if (result.affectedRows !== 1) throw bankNotFound()
  return summary(await requireBankOwner(owner, id))
}

export async function duplicateBank(owner: User, id: number) {
  const bank = await requireBankOwner(owner, id)
  const name = `Copy of ${bank.name}`.slice(0, BANK_NAME_MAX)
  return createBank(owner, name, bank.document, bank.kind)
}

/** Gives the bank a read-only link (the same one again if it has one). */
export async function shareBank(owner: User, id: number) {
  const bank = await requireBankOwner(owner, id)
  let token = bank.shareToken
  if (!token) {
    token = newLinkToken()
    await useDB().update(banks).set({ shareToken: token })
      .where(and(eq(banks.id, id), eq(banks.ownerId, owner.id), isNull(banks.shareToken)))
    token = (await requireBankOwner(owner, id)).shareToken!
  }
  return { token, url: shareUrlOf(token) }
}

export async function unshareBank(owner: User, id: number) {
  await requireBankOwner(owner, id)
  await useDB().update(banks).set({ shareToken: null }).where(and(eq(banks.id, id), eq(banks.ownerId, owner.id)))
}

/** What a read-only link shows: the bank's name and document, while it is shared and not deleted. */
export async function sharedBank(token: string) {
  const [bank] = await useDB().select({ name: banks.name, document: banks.document }).from(banks)
    .where(and(eq(banks.shareToken, token), isNull(banks.deletedAt)))
  if (!bank) throw createError({ statusCode: 404, statusMessage: 'This link is not shared, or no longer' })
  return bank
}
