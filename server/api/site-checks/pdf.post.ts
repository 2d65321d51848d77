/** POST /api/site-checks/pdf — the pre-energization sheet of a Site check as a PDF download. */
import { SITE_CHECK_ROLES, SiteCheckInputSchema } from '#shared/site-check'
import { sheetFileName, siteCheckSheetPdf } from '~~/server/services/site-checks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...SITE_CHECK_ROLES)
  const input = await readBodyWith(event, SiteCheckInputSchema)
  const pdf = await siteCheckSheetPdf(owner, input)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `attachment; filename="${sheetFileName(input.name)}"`,
    'cache-control': 'no-store',
  })
  return Buffer.from(pdf)
})
