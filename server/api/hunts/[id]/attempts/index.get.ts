/** GET /api/hunts/[id]/attempts — the author's results table and summary; `?format=csv` for a spreadsheet. */
import { idParams } from '#shared/schemas/params'
import { huntResults, resultsCsv } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const { format } = queryWith(event, FormatQuerySchema)
  const results = await huntResults(instructor, id)
  if (format === 'json') return results
  return sendCsv(event, `hunt-${id}-results.csv`, resultsCsv(results.rows))
})
