/** GET /api/invitations/[token] — whom an open invitation is for (and whether that is the signed-in user). */
import { tokenParams } from '#shared/schemas/params'
import { openInvitation } from '~~/server/services/invitations'

export default defineEventHandler(async (event) => {
  const signedIn = await currentUser(event)
  const { token } = paramsWith(event, tokenParams)
  const invitation = await openInvitation(token)
  return { email: invitation.email, name: invitation.name, forSignedInUser: signedIn?.email === invitation.email }
})
