/** POST /api/attempts/[id]/probe — the meter between two terminals of the student's wiring, faults applied on the server. */
import { ProbeSchema } from '#shared/schemas/hunts'
import { idParams } from '#shared/schemas/params'
import { probe } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { data, raw } = await readBodyAndRaw(event, ProbeSchema)
  return probe(event, student, id, { document: raw.document as Record<string, unknown>, from: data.from, to: data.to })
})
