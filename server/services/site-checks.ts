/** Site checks: planned on the server for the PDF, saved with the user's banks (kind 'site-check'). */
import { planSiteCheck as plan, SITE_CHECK_KEY, type SiteCheckInput } from '#shared/site-check'
import type { User } from '../db/schema'
import { createBank } from './banks'
import { siteCheckPdf } from './site-check-pdf'

/** The plan, or 422 when the engine finds no solution for the bank (never a 5xx for an input the schema let through). */
export function planSiteCheck(input: SiteCheckInput) {
  try {
    return plan(input)
  } catch (e) {
    throw createError({
      statusCode: 422,
      statusMessage: 'This bank has no solution',
      data: { errors: [{ path: '(body)', message: `the engine could not solve this bank: ${(e as Error).message}` }] },
    })
  }
}

/**
 * Saves the site check as a bank: the document is the one that opens on the Bench (a valid
 * circuit document v1), with the inputs kept under `siteCheck` — an extra top-level field,
 * which v1 readers keep and ignore (circuit-format.md: later fields are optional).
 */
export async function saveSiteCheck(owner: User, input: SiteCheckInput) {
  const plan = planSiteCheck(input)
  const document = { ...plan.document, [SITE_CHECK_KEY]: input } as Record<string, unknown>
  return createBank(owner, input.name, document, 'site-check')
}

export async function siteCheckSheetPdf(owner: User, input: SiteCheckInput) {
  return siteCheckPdf(planSiteCheck(input), { preparedBy: owner.name })
}

/** A file name from the site check's name: letters, digits and dashes. */
export function sheetFileName(name: string) {
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60)
  return `site-check-${slug || 'bank'}.pdf`
}
