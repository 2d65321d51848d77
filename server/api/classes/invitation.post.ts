/** POST /api/classes/invitation — the class an invitation link is for, before it is used (the token in the body, not the URL). */
import { InvitationPreviewSchema } from '#shared/schemas/classes'
import { previewInvitation } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const body = await readBodyWith(event, InvitationPreviewSchema)
  return previewInvitation(user, body.token)
})
