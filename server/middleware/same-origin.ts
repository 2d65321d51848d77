/**
 * Refuses a state-changing API request sent by a page of another site (cross-site request
 * forgery): browsers send `Origin` (and `Sec-Fetch-Site`) with every such request. A
 * request with neither (a command-line client, a server) is not a browser's and passes;
 * the session cookie is also SameSite=Lax.
 */
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

export default defineEventHandler((event) => {
  if (SAFE.has(event.method) || !event.path.startsWith('/api/')) return
  const site = getRequestHeader(event, 'sec-fetch-site')
  const origin = getRequestHeader(event, 'origin')
  let foreign = site === 'cross-site'
  if (!foreign && origin) {
    const own = new Set([getRequestHost(event, { xForwardedHost: true })])
    try {
      own.add(new URL(String(useRuntimeConfig(event).public.baseUrl)).host)
      foreign = origin === 'null' || !own.has(new URL(origin).host)
    }
    catch {
      foreign = true
    }
  }
  if (foreign) {
    throw createError({ statusCode: 403, statusMessage: 'Cross-site request refused', data: { errors: [{ path: '(origin)', message: 'this request came from another site: Phaseloom only accepts changes made from its own pages' }] } })
  }
})
