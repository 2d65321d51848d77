/** POST /api/invitations/[token]/accept — become an instructor: a new account, or the signed-in invitee's own. */
import { AcceptInvitationSchema } from '#shared/schemas/account'
import { tokenParams } from '#shared/schemas/params'
import { acceptInvitation } from '~~/server/services/invitations'
import { userNotice } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const signedIn = await currentUser(event)
  const { token } = paramsWith(event, tokenParams)
  const body = await readBodyWith(event, AcceptInvitationSchema)
  const { user, created } = await acceptInvitation(event, token, signedIn, body)
  setResponseStatus(event, created ? 201 : 200)
  return userNotice(user)
})
