/** GET /api/hunts/[id] — the author's view (faults included) or a class member's (no faults, no bank). */
import { idParams } from '#shared/schemas/params'
import { huntFor } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  return huntFor(user, id)
})
