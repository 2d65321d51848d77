/** GET /api/invitations/[token] — whom an open invitation is for. */
import { tokenParams } from '#shared/schemas/params'
import { openInvitation } from '~~/server/services/invitations'

export default defineEventHandler(async (event) => {
  const { token } = paramsWith(event, tokenParams)
  const invitation = await openInvitation(token)
  return { email: invitation.email, name: invitation.name }
})
