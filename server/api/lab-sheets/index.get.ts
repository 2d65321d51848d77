/** GET /api/lab-sheets — "My lab sheets"; `?classId=` the sheets handed in to a class the caller teaches (`&status=`). */
import { LabSheetListQuerySchema } from '#shared/schemas/lab-sheets'
import { listSheets } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const query = queryWith(event, LabSheetListQuerySchema)
  return listSheets(user, query)
})
