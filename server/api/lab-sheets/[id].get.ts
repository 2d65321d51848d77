/** GET /api/lab-sheets/[id] — the sheet with its comparison (`?format=csv` for a spreadsheet); owner or class instructor. */
import { z } from 'zod'
import { idParams } from '#shared/schemas/params'
import { readableSheet, sheetCsv, sheetView } from '~~/server/services/lab-sheets'

const QuerySchema = z.object({ format: z.enum(['json', 'csv'], { error: 'format is json or csv' }).default('json') })

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { format } = queryWith(event, QuerySchema)
  const { sheet, as } = await readableSheet(user, id)
  const view = await sheetView(sheet, as)
  if (format === 'json') return view
  setResponseHeader(event, 'Content-Type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'Content-Disposition', `attachment; filename="lab-sheet-${id}.csv"`)
  return sheetCsv(view)
})
