/** POST /api/auth/sign-out — ends this browser's session. */
export default defineEventHandler(async (event) => {
  await clearUserSession(event)
  setResponseStatus(event, 204)
  return null
})
