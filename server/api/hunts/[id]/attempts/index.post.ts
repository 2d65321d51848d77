/** POST /api/hunts/[id]/attempts — start the caller's attempt, or resume it. */
import { idParams } from '#shared/schemas/params'
import { startAttempt } from '~~/server/services/attempts'

export default defineEventHandler(async (event) => {
  const student = await requireRole(event, ...MEMBER_ROLES)
  const { id } = paramsWith(event, idParams)
  return startAttempt(student, id)
})
