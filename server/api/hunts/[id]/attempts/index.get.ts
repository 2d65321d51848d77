/** GET /api/hunts/[id]/attempts — the author's results table and summary; `?format=csv` for a spreadsheet. */
import { z } from 'zod'
import { idParams } from '#shared/schemas/params'
import { huntResults, resultsCsv } from '~~/server/services/attempts'

const QuerySchema = z.object({ format: z.enum(['json', 'csv'], { error: 'format is json or csv' }).default('json') })

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const { format } = queryWith(event, QuerySchema)
  const results = await huntResults(instructor, id)
  if (format === 'json') return results
  setResponseHeader(event, 'Content-Type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'Content-Disposition', `attachment; filename="hunt-${id}-results.csv"`)
  return resultsCsv(results.rows)
})
