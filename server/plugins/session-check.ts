// The browser learns of its session from GET /api/_auth/session; check it against the database
// there too, so a deactivated or signed-out-everywhere user is shown as signed out.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    if (!session.user) return
    const user = await currentUser(event)
    if (!user) throw createError({ statusCode: 401, statusMessage: 'Your session has ended: sign in again' })
    session.user = sessionUserOf(user)
  })
})
