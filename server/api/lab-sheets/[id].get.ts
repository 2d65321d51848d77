/** GET /api/lab-sheets/[id] — the sheet with its comparison (`?format=csv` for a spreadsheet); owner or class instructor. */
import { idParams } from '#shared/schemas/params'
import { readableSheet, sheetCsv, sheetView } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { format } = queryWith(event, FormatQuerySchema)
  const { sheet, as } = await readableSheet(user, id)
  const view = await sheetView(sheet, as)
  if (format === 'json') return view
  return sendCsv(event, `lab-sheet-${id}.csv`, sheetCsv(view))
})
