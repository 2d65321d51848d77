/** POST /api/auth/sign-up — a student or practitioner account, signed in at once. */
import { SignUpSchema } from '#shared/schemas/account'
import { signUp, userNotice } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const body = await readBodyWith(event, SignUpSchema)
  const user = await signUp(event, body)
  setResponseStatus(event, 201)
  return userNotice(user)
})
