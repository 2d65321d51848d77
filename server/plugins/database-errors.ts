import type { H3Event } from 'h3'

/**
 * When the database cannot be reached (stopped, restarting, the connection dropped), a route
 * answers 503 with a plain message instead of a 500: the request can be tried again, and
 * nothing was written. The pool opens fresh connections by itself once the database is back.
 * Any other unexpected failure (a 500) is logged as one line naming the route, the user and the error.
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

interface Failure { name?: string, code?: unknown, message?: string, sqlMessage?: string, stack?: string, cause?: unknown }

/** One line for the log: the error's name, code and first line, never a value it carried. */
export function failureSummary(error: unknown): string {
  const chain: Failure[] = []
  for (let e = error as Failure | undefined, depth = 0; e && typeof e === 'object' && depth < 8; e = e.cause as Failure | undefined, depth++) chain.push(e)
  // the driver's own error says what the database refused; the wrappers above it (Drizzle's
  // "Failed query", h3's) carry the query's parameters, which hold the body
  const cause = [...chain].reverse().find(e => typeof e.code === 'string') ?? chain.at(-1) ?? {}
  const words = String(cause.sqlMessage ?? cause.message ?? error).split('\n')[0]!.split(/\bparams:/)[0]!
  const frames = (chain[0]?.stack ?? '').split('\n').filter(line => /^\s+at /.test(line)).slice(0, 6).join('\n')
  return `${cause.name ?? 'Error'}${typeof cause.code === 'string' ? ` ${cause.code}` : ''}: ${words.slice(0, 300)}${frames ? `\n${frames}` : ''}`
}

/** The signed-in user's id as the session read it during the request, if it did. */
function userIdOf(event: H3Event): string {
  const sessions = event.context.sessions as Record<string, { data?: { user?: { id?: unknown } } }> | undefined
  const id = sessions?.['nuxt-session']?.data?.user?.id
  return id === undefined ? 'anonymous' : `user ${String(id)}`
}

export default defineNitroPlugin((nitroApp) => {
  // the hook runs before the error handler renders the answer, so the status set here is the one sent
  nitroApp.hooks.hook('error', (error, { event }) => {
    const h3error = error as { unhandled?: boolean, fatal?: boolean }
    if (event && !isDatabaseUnavailable(error) && (h3error.unhandled || h3error.fatal)) {
      // the route, who asked and what failed; Nitro's own log would print the whole error,
      // and a refused query's error holds every parameter (a whole document)
      console.error(`[request error] ${event.method} ${event.path.split('?')[0]} ${userIdOf(event)}: ${failureSummary(error)}`)
      Object.assign(error, { unhandled: false, fatal: false, message: 'Server Error', statusMessage: 'Server Error', data: undefined, cause: undefined })
      return
    }
    if (!isDatabaseUnavailable(error)) return
    const h3 = error as { statusCode?: number, statusMessage?: string, unhandled?: boolean, data?: unknown, message: string }
    h3.statusCode = 503
    h3.statusMessage = 'The database is not answering'
    h3.message = 'The database is not answering: nothing was saved. Try again in a moment.'
    h3.data = { errors: [{ path: '(server)', message: 'the database is not answering: nothing was saved; try again in a moment' }] }
    h3.unhandled = false
  })
})
