/** DELETE /api/classes/[id]/members/[userId] — the instructor takes a student off the roster (204). */
import { memberParams } from '#shared/schemas/classes'
import { removeMember } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id, userId } = paramsWith(event, memberParams)
  await removeMember(instructor, id, userId)
  setResponseStatus(event, 204)
  return null
})
