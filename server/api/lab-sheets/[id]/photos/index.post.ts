/** POST /api/lab-sheets/[id]/photos — multipart field "photo" (JPEG, PNG or WebP, 8 MB at most) and "caption" (201). */
import { idParams } from '#shared/schemas/params'
import { addPhoto } from '~~/server/services/photos'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const photo = await addPhoto(event, owner, id)
  setResponseStatus(event, 201)
  return photo
})
