/** POST /api/site-checks/plan — the Site check plan as JSON (the page plans in the browser; this is the same code on the server). */
import { SITE_CHECK_ROLES, SiteCheckInputSchema } from '#shared/site-check'
import { planSiteCheck } from '~~/server/services/site-checks'

export default defineEventHandler(async (event) => {
  await requireRole(event, ...SITE_CHECK_ROLES)
  const input = await readBodyWith(event, SiteCheckInputSchema)
  return planSiteCheck(input)
})
