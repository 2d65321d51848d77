/** POST /api/site-checks — save a Site check with the user's banks (kind 'site-check'): 201 with its id and version 1. */
import { SITE_CHECK_ROLES, SiteCheckInputSchema } from '#shared/site-check'
import { saveSiteCheck } from '~~/server/services/site-checks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...SITE_CHECK_ROLES)
  const input = await readBodyWith(event, SiteCheckInputSchema)
  const created = await saveSiteCheck(owner, input)
  setResponseStatus(event, 201)
  return created
})
