/** POST /api/lab-sheets — a sheet from one of the caller's banks or a starter (201). */
import { LabSheetCreateSchema } from '#shared/schemas/lab-sheets'
import { createSheet } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const body = await readBodyWith(event, LabSheetCreateSchema)
  const sheet = await createSheet(owner, body)
  setResponseStatus(event, 201)
  return sheet
})
