/**
 * When the database cannot be reached (stopped, restarting, the connection dropped), a route
 * answers 503 with a plain message instead of a 500: the request can be tried again, and
 * nothing was written. The pool opens fresh connections by itself once the database is back.
 */
const CONNECTION_CODES = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENOTFOUND',
  'PROTOCOL_CONNECTION_LOST', 'PROTOCOL_SEQUENCE_TIMEOUT', 'ER_SERVER_SHUTDOWN', 'ER_CON_COUNT_ERROR',
  'ER_CONNECTION_KILLED', 'ER_NORMAL_SHUTDOWN',
])

/** True when `error` (or anything in its cause chain) is a lost or refused database connection. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e = error as { code?: unknown, cause?: unknown } | undefined, depth = 0; e && depth < 8; e = e.cause as typeof e, depth++) {
    if (typeof e.code === 'string' && CONNECTION_CODES.has(e.code)) return true
    if (e instanceof Error && /Connection lost|Pool is closed|Can't add new command when connection is in closed state/i.test(e.message)) return true
  }
  return false
}

export default defineNitroPlugin((nitroApp) => {
  // the hook runs before the error handler renders the answer, so the status set here is the one sent
  nitroApp.hooks.hook('error', (error) => {
    if (!isDatabaseUnavailable(error)) return
    const h3 = error as { statusCode?: number, statusMessage?: string, unhandled?: boolean, data?: unknown, message: string }
    h3.statusCode = 503
    h3.statusMessage = 'The database is not answering'
    h3.message = 'The database is not answering: nothing was saved. Try again in a moment.'
    h3.data = { errors: [{ path: '(server)', message: 'the database is not answering: nothing was saved; try again in a moment' }] }
    h3.unhandled = false
  })
})
