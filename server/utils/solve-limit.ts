import type { H3Event } from 'h3'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'

let ready: Promise<RateLimiterMySQL> | undefined

/**
 * Anonymous `POST /api/solve` per IP, counted in our database (table `solve_limits`, which the
 * library makes itself on first use, so every app instance sharing the database shares the
 * count). Runtime config `solveLimit`: `points` (60) solves within `windowSeconds` (60).
 */
function solveLimiter(): Promise<RateLimiterMySQL> {
  ready ??= new Promise((resolve, reject) => {
    const config = useRuntimeConfig()
    const limit = (config.solveLimit ?? {}) as { points?: number, windowSeconds?: number }
    const limiter: RateLimiterMySQL = new RateLimiterMySQL({
      storeClient: useDB().$client.pool,
      storeType: 'pool',
      dbName: decodeURIComponent(new URL(config.databaseUrl).pathname.slice(1)),
      tableName: 'solve_limits',
      keyPrefix: 'solve',
      points: Number(limit.points ?? 60),
      duration: Number(limit.windowSeconds ?? 60),
    }, (error?: Error) => {
      if (error) {
        ready = undefined
        reject(error)
      }
      else resolve(limiter)
    })
  })
  return ready
}

/** Counts one anonymous solve from this address; 429 with Retry-After past the limit. */
export async function consumeAnonymousSolve(event: H3Event): Promise<void> {
  const limiter = await solveLimiter()
  try {
    await limiter.consume(getRequestIP(event) ?? 'unknown')
  }
  catch (rejection) {
    if (!(rejection instanceof RateLimiterRes)) throw rejection
    const seconds = Math.max(1, Math.ceil(rejection.msBeforeNext / 1000))
    setResponseHeader(event, 'Retry-After', seconds)
    throw createError({ statusCode: 429, statusMessage: 'Too many solves from this address', data: { retryAfterSeconds: seconds, errors: [{ path: '(body)', message: `too many solves without signing in: wait ${seconds} s, or sign in` }] } })
  }
}
