import { createHash } from 'node:crypto'
import { RateLimiterMySQL } from 'rate-limiter-flexible'

let limiter: RateLimiterMySQL | undefined

/**
 * Failed sign-ins per e-mail and IP, counted in our database (table `sign_in_limits`, made by
 * our migrations, so every app instance sharing the database shares the count).
 * Runtime config `signInLimit`: `attempts` (5) failures within `windowSeconds` (900).
 */
export function signInLimiter(): RateLimiterMySQL {
  if (limiter) return limiter
  const config = useRuntimeConfig()
  const { attempts, windowSeconds } = config.signInLimit
  const pool = useDB().$client
  limiter = new RateLimiterMySQL({
    // the library speaks mysql2's callback API: hand it the pool under the promise wrapper
    storeClient: pool.pool,
    storeType: 'pool',
    dbName: decodeURIComponent(new URL(config.databaseUrl).pathname.slice(1)),
    tableName: 'sign_in_limits',
    tableCreated: true,
    keyPrefix: 'sign-in',
    points: Number(attempts),
    duration: Number(windowSeconds),
  })
  return limiter
}

/** The limiter's key: a hash, so the table holds no e-mail addresses. */
export function signInLimitKey(email: string, ip: string): string {
  return createHash('sha256').update(`${email}\n${ip}`, 'utf8').digest('hex')
}
