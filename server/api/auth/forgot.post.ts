/** POST /api/auth/forgot — mails a reset link if the account exists; always 202. */
import { ForgotSchema } from '#shared/schemas/account'
import { requestPasswordReset } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const { email } = await readBodyWith(event, ForgotSchema)
  await requestPasswordReset(email)
  setResponseStatus(event, 202)
  return { accepted: true }
})
