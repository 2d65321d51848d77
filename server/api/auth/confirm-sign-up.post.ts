/** POST /api/auth/confirm-sign-up — the mailed token makes the account and signs it in; 404 when not valid. */
import { ConfirmSignUpSchema } from '#shared/schemas/account'
import { userNotice } from '~~/server/services/accounts'
import { confirmSignUp } from '~~/server/services/sign-up'

export default defineEventHandler(async (event) => {
  const { token } = await readBodyWith(event, ConfirmSignUpSchema)
  const user = await confirmSignUp(event, token)
  setResponseStatus(event, 201)
  return userNotice(user)
})
