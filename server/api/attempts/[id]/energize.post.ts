/** POST /api/attempts/[id]/energize — what energizing this wiring does (protective operations, unsafe closures recorded). */
import { EnergizeSchema } from '#shared/schemas/hunts'
import { idParams } from '#shared/schemas/params'
import { energize } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { raw } = await readBodyAndRaw(event, EnergizeSchema)
  return energize(student, id, raw.document as Record<string, unknown>)
})
