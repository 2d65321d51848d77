/** GET /api/classes — the classes the caller teaches or belongs to. */
import { listClasses } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  return listClasses(user)
})
