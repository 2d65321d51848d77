/** DELETE /api/lab-sheets/[id] — a draft and its photos (204). */
import { idParams } from '#shared/schemas/params'
import { deleteSheet } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  await deleteSheet(owner, id)
  setResponseStatus(event, 204)
  return null
})
