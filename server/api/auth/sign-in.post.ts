/** POST /api/auth/sign-in — e-mail and password; 401 either wrong, 429 after repeated failures. */
import { SignInSchema } from '#shared/schemas/account'
import { signIn, userNotice } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const body = await readBodyWith(event, SignInSchema)
  return userNotice(await signIn(event, body))
})
