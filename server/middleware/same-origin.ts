/**
 * Refuses a state-changing API request sent by a page of another site (cross-site request
 * forgery): browsers send `Origin` (and `Sec-Fetch-Site`) with every such request. A
 * request with neither (a command-line client, a server) is not a browser's and passes;
 * the session cookie is also SameSite=Lax.
 *
 * The Origin must be ours in scheme, host and port alike: the address this request came to
 * (X-Forwarded-Host and X-Forwarded-Proto count only behind a proxy, NUXT_TRUST_PROXY=true,
 * since anyone can send them to a server that faces the world), or NUXT_PUBLIC_BASE_URL.
 */
import type { H3Event } from 'h3'

const SAFE = new Set(['GET', 'HEAD'])

/** The origins (scheme://host:port) this server answers as. */
function ownOrigins(event: H3Event): Set<string> {
  const config = useRuntimeConfig(event)
  const trustProxy = config.trustProxy === true || String(config.trustProxy) === 'true'
  const own = new Set<string>()
  for (const address of [
    `${getRequestProtocol(event, { xForwardedProto: trustProxy })}://${getRequestHost(event, { xForwardedHost: trustProxy })}`,
    String(config.public.baseUrl),
  ]) {
    try {
      own.add(new URL(address).origin)
    }
    catch { /* not an address: it names nothing of ours */ }
  }
  return own
}

function isForeign(event: H3Event, origin: string): boolean {
  if (origin === 'null') return true
  try {
    return !ownOrigins(event).has(new URL(origin).origin)
  }
  catch {
    return true
  }
}

export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  // a CORS preflight: answered here with no access-control-allow-* header, so a browser on
  // another site never gets to send the request (and the page renderer never sees it)
  if (event.method === 'OPTIONS') {
    setResponseHeader(event, 'allow', 'GET, HEAD, POST, PATCH, DELETE')
    setResponseStatus(event, 204)
    return ''
  }
  if (SAFE.has(event.method)) return
  const site = getRequestHeader(event, 'sec-fetch-site')
  const origin = getRequestHeader(event, 'origin')
  if (site === 'cross-site' || (origin !== undefined && isForeign(event, origin))) {
    throw createError({ statusCode: 403, statusMessage: 'Cross-site request refused', data: { errors: [{ path: '(origin)', message: 'this request came from another site: Phaseloom only accepts changes made from its own pages' }] } })
  }
})
