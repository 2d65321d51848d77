/** GET /api/lab-sheets/[id]/photos/[photoId] — the image (`?size=thumb` for the thumbnail); owner or class instructor. */
import { z } from 'zod'
import { photoParams } from '#shared/schemas/lab-sheets'
import { readPhoto } from '~~/server/services/photos'

const QuerySchema = z.object({ size: z.enum(['full', 'thumb'], { error: 'size is full or thumb' }).default('full') })

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id, photoId } = paramsWith(event, photoParams)
  const { size } = queryWith(event, QuerySchema)
  return readPhoto(event, user, id, photoId, size === 'thumb')
})
