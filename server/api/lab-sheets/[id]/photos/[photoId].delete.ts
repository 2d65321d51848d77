/** DELETE /api/lab-sheets/[id]/photos/[photoId] — removes a photo from a sheet still being written (204). */
import { photoParams } from '#shared/schemas/lab-sheets'
import { removePhoto } from '~~/server/services/photos'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id, photoId } = paramsWith(event, photoParams)
  await removePhoto(owner, id, photoId)
  setResponseStatus(event, 204)
  return null
})
