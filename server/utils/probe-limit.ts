import type { H3Event } from 'h3'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'

let limiter: RateLimiterMySQL | undefined

/**
 * Probes per attempt, counted in our database (table `probe_limits`), so every app instance
 * shares the count. Runtime config `probeLimit`: `points` (30) probes within `windowSeconds` (30).
 */
function probeLimiter(): RateLimiterMySQL {
  if (limiter) return limiter
  const config = useRuntimeConfig()
  limiter = new RateLimiterMySQL({
    storeClient: useDB().$client.pool,
    storeType: 'pool',
    dbName: decodeURIComponent(new URL(config.databaseUrl).pathname.slice(1)),
    tableName: 'probe_limits',
    tableCreated: true,
    keyPrefix: 'probe',
    points: Number(config.probeLimit.points),
    duration: Number(config.probeLimit.windowSeconds),
  })
  return limiter
}

/** Counts one probe of `attemptId`; 429 with Retry-After when the attempt probes too fast. */
export async function consumeProbe(event: H3Event, attemptId: number): Promise<void> {
  try {
    await probeLimiter().consume(String(attemptId))
  }
  catch (rejection) {
    if (!(rejection instanceof RateLimiterRes)) throw rejection
    const seconds = Math.max(1, Math.ceil(rejection.msBeforeNext / 1000))
    setResponseHeader(event, 'Retry-After', seconds)
    throw createError({ statusCode: 429, statusMessage: 'Too many probes at once', data: { retryAfterSeconds: seconds, errors: [{ path: 'from', message: `probing too fast: wait ${seconds} s and probe again` }] } })
  }
}
