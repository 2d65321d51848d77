/** GET /api/classes/[id] — the instructor's view (roster, join code, invitations) or a member's. */
import { idParams } from '#shared/schemas/params'
import { classDetail } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  return classDetail(user, id)
})
