/** POST /api/lab-sheets/[id]/submit — hand the sheet in to a class the caller belongs to. */
import { LabSheetSubmitSchema } from '#shared/schemas/lab-sheets'
import { idParams } from '#shared/schemas/params'
import { submitSheet } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { classId } = await readBodyWith(event, LabSheetSubmitSchema)
  return submitSheet(owner, id, classId)
})
