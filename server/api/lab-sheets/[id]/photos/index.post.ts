/** POST /api/lab-sheets/[id]/photos — multipart field "photo" (JPEG, PNG or WebP, 8 MB at most) and "caption" (201). */
import { idParams } from '#shared/schemas/params'
import { PHOTO_LIMIT_BYTES } from '#shared/schemas/lab-sheets'
import { addPhoto } from '~~/server/services/photos'

// multipart framing and the caption on top of the file itself
const UPLOAD_LIMIT_BYTES = PHOTO_LIMIT_BYTES + 64 * 1024

const tooLarge = () => createError({
  statusCode: 413,
  statusMessage: 'Photo too large',
  data: { errors: [{ path: 'photo', message: `the photo is larger than ${(PHOTO_LIMIT_BYTES / 1024 / 1024).toFixed(1)} MB: take it at a lower resolution` }] },
})

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  // read here, by bytes as they arrive, so the multipart parser after it works on at most
  // the limit (h3 reads a body it is handed before the socket's)
  const body = await readLimitedBody(event, UPLOAD_LIMIT_BYTES, tooLarge)
  if (body) {
    (event as { _requestBody?: unknown })._requestBody = body
    // a chunked upload's length is known now that it has arrived whole
    event.node.req.headers['content-length'] = String(body.length)
  }
  const photo = await addPhoto(event, owner, id)
  setResponseStatus(event, 201)
  return photo
})
