/** GET /api/attempts/[id] — the caller's own attempt, or one at a hunt they wrote. */
import { idParams } from '#shared/schemas/params'
import { attemptFor } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  return attemptFor(user, id)
})
