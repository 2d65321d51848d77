/** DELETE /api/hunts/[id] — withdraws the hunt from every class (204). */
import { idParams } from '#shared/schemas/params'
import { deleteHunt } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  await deleteHunt(instructor, id)
  setResponseStatus(event, 204)
  return null
})
