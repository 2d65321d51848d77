/** POST /api/admin/invitations — mail an instructor invitation. */
import { InvitationSchema } from '#shared/schemas/account'
import { inviteInstructor } from '~~/server/services/admin'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { email, name } = await readBodyWith(event, InvitationSchema)
  const invitation = await inviteInstructor(admin, email, name)
  setResponseStatus(event, 201)
  return invitation
})
