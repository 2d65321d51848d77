/** GET /api/hunts — the caller's own hunts (instructors) and those published to their classes. */
import { listHunts } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  return listHunts(user)
})
