/** POST /api/auth/sign-out — ends this browser's session: its row is revoked, so the old cookie gets 401 afterwards. */
export default defineEventHandler(async (event) => {
  await endSession(event)
  setResponseStatus(event, 204)
  return null
})
