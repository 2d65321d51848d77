/** PATCH /api/lab-sheets/[id] — readings, supply, notes, title or class, if `version` is still current. */
import { LabSheetPatchSchema } from '#shared/schemas/lab-sheets'
import { idParams } from '#shared/schemas/params'
import { updateSheet } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const change = await readBodyWith(event, LabSheetPatchSchema)
  return updateSheet(owner, id, change)
})
