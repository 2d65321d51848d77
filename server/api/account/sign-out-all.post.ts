/** POST /api/account/sign-out-all — "Sign out everywhere": ends every session of the signed-in user, this one too. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  await revokeAllSessions(user.id)
  await endSession(event)
  setResponseStatus(event, 204)
  return null
})
