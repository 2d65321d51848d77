/**
 * POST /api/auth/sign-up — always 202 with the same words: a new address gets a link to finish
 * the account (POST /api/auth/confirm-sign-up), a registered one a note to its owner.
 */
import { SignUpSchema } from '#shared/schemas/account'
import { requestSignUp, SIGN_UP_ACCEPTED } from '~~/server/services/sign-up'

export default defineEventHandler(async (event) => {
  const body = await readBodyWith(event, SignUpSchema)
  await requestSignUp(body)
  setResponseStatus(event, 202)
  return { accepted: true, message: SIGN_UP_ACCEPTED }
})
