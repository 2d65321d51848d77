/** POST /api/attempts/[id]/submit — the diagnosis; the attempt is read-only afterwards. */
import { SubmitSchema } from '#shared/schemas/hunts'
import { idParams } from '#shared/schemas/params'
import { submit } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  const { data, raw } = await readBodyAndRaw(event, SubmitSchema)
  return submit(student, id, { diagnosis: data.diagnosis, document: raw.document as Record<string, unknown> | undefined })
})
