/** POST /api/classes/[id]/invitations — mail each address a single-use link to join (14 days). */
import { ClassInviteSchema } from '#shared/schemas/classes'
import { idParams } from '#shared/schemas/params'
import { inviteToClass } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const { emails } = await readBodyWith(event, ClassInviteSchema)
  const sent = await inviteToClass(instructor, id, emails)
  setResponseStatus(event, 201)
  return sent
})
