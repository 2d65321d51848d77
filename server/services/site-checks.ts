/** Site checks: planned on the server for the PDF, saved with the user's banks (kind 'site-check'). */
import { SITE_CHECK_KEY, type SiteCheckInput, type SitePlan } from '#shared/site-check'
import type { User } from '../db/schema'
import { createBank } from './banks'

/**
 * The plan, worked out in the engine's pool, or 422 when the engine finds no solution for the
 * bank (never a 5xx for an input the schema let through).
 */
export async function planSiteCheck(input: SiteCheckInput): Promise<SitePlan> {
  const outcome = await runEngine('sitePlan', input)
  if (!outcome.ok) throw engineFailure(outcome)
  return outcome.plan
}

/**
 * Saves the site check as a bank: the document is the one that opens on the Bench (a valid
 * circuit document v1), with the inputs kept under `siteCheck` — an extra top-level field,
 * which v1 readers keep and ignore (circuit-format.md: later fields are optional).
 */
export async function saveSiteCheck(owner: User, input: SiteCheckInput) {
  const plan = await planSiteCheck(input)
  const document = { ...plan.document, [SITE_CHECK_KEY]: input } as Record<string, unknown>
  return createBank(owner, input.name, document, 'site-check')
}

/** The printable sheet as a PDF (server/services/site-check-pdf.ts), planned and written in the engine's pool. */
export async function siteCheckSheetPdf(owner: User, input: SiteCheckInput): Promise<Uint8Array> {
  const outcome = await runEngine('sitePdf', { input, preparedBy: owner.name })
  if (!outcome.ok) throw engineFailure(outcome)
  return outcome.pdf
}

/** A file name from the site check's name: letters, digits and dashes. */
export function sheetFileName(name: string) {
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60)
  return `site-check-${slug || 'bank'}.pdf`
}
