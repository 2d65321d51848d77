// Admin pages: signed-out people sign in first; other roles get a 403 page.
export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn, user } = useUserSession()
  if (!loggedIn.value) return navigateTo({ path: '/sign-in', query: { next: to.fullPath } })
  if (user.value?.role !== 'admin') {
    return abortNavigation(createError({ statusCode: 403, statusMessage: 'Only admins may open this page' }))
  }
})
