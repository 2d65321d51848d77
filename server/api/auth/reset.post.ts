/** POST /api/auth/reset — a new password from a reset link; signs the account out everywhere. */
import { ResetSchema } from '#shared/schemas/account'
import { resetPassword } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const { token, password } = await readBodyWith(event, ResetSchema)
  const user = await resetPassword(token, password)
  return { ok: true, email: user.email }
})
