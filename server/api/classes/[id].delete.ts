/** DELETE /api/classes/[id] — removes the class, its roster and its invitations (204). */
import { idParams } from '#shared/schemas/params'
import { deleteClass } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  await deleteClass(instructor, id)
  setResponseStatus(event, 204)
  return null
})
