// The browser learns of its session from GET /api/_auth/session; check it against the database
// there too, so a deactivated or signed-out-everywhere user is shown as signed out.
// Whenever a session is cleared (sign-out, DELETE /api/_auth/session, a refused cookie), its
// row is revoked, so a copy of the old cookie is refused on every instance from then on.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    if (!session.user) return
    const user = await currentUser(event)
    if (!user) throw createError({ statusCode: 401, statusMessage: 'Your session has ended: sign in again' })
    session.user = sessionUserOf(user)
  })
  sessionHooks.hook('clear', async (session) => {
    await revokeSession(session.secure?.sessionId)
  })
})
