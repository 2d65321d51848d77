import { createHash } from 'node:crypto'
import type { H3Event } from 'h3'
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible'

/*
 * Guessing passwords, limited the way rate-limiter-flexible's documentation sets out for a
 * login route (its "brute-force protection" pattern), with two counters:
 *  - consecutive failures for one e-mail from one address: `signInLimit.attempts` (5) within
 *    `signInLimit.windowSeconds` (900), cleared by a right password;
 *  - failures from one address, whatever the e-mail: ADDRESS_FAILURES_PER_DAY within a day,
 *    which stops one address from trying a few passwords on each of many accounts.
 * Neither is keyed on the e-mail alone, so failures from someone else's address never lock
 * the owner out. A point is taken from both BEFORE the password is checked (the consume is one
 * atomic upsert in MariaDB), so parallel guesses cannot all slip under the limit; a right
 * password gives its points back. Both counters live in our table `sign_in_limits` (distinct
 * key prefixes), so every app instance sharing the database shares them.
 */
const ADDRESS_FAILURES_PER_DAY = 100
const DAY_SECONDS = 24 * 3600

let perEmailAndAddress: RateLimiterMySQL | undefined
let perAddress: RateLimiterMySQL | undefined

function mysqlLimiter(keyPrefix: string, points: number, duration: number): RateLimiterMySQL {
  const config = useRuntimeConfig()
  return new RateLimiterMySQL({
    // the library speaks mysql2's callback API: hand it the pool under the promise wrapper
    storeClient: useDB().$client.pool,
    storeType: 'pool',
    dbName: decodeURIComponent(new URL(config.databaseUrl).pathname.slice(1)),
    tableName: 'sign_in_limits',
    tableCreated: true,
    keyPrefix,
    points,
    duration,
  })
}

/** Consecutive failed password checks per e-mail and IP (runtime config `signInLimit`). */
export function signInLimiter(): RateLimiterMySQL {
  const { attempts, windowSeconds } = useRuntimeConfig().signInLimit
  perEmailAndAddress ??= mysqlLimiter('sign-in', Number(attempts), Number(windowSeconds))
  return perEmailAndAddress
}

/** Failed password checks per IP in a day. */
export function addressLimiter(): RateLimiterMySQL {
  perAddress ??= mysqlLimiter('sign-in-address', ADDRESS_FAILURES_PER_DAY, DAY_SECONDS)
  return perAddress
}

const hashed = (text: string) => createHash('sha256').update(text, 'utf8').digest('hex')

/** The limiter's key: a hash, so the table holds no e-mail addresses. */
export function signInLimitKey(email: string, ip: string): string {
  return hashed(`${email}\n${ip}`)
}

function isDeadlock(error: unknown): boolean {
  const code = (error as { code?: string })?.code
  return code === 'ER_LOCK_DEADLOCK' || code === 'ER_LOCK_WAIT_TIMEOUT'
}

/**
 * consume(): the limiter's answer when it refuses (spent), null when the point was taken.
 * Tried again when InnoDB picks the upsert as a deadlock victim (parallel first failures on one key).
 */
async function consume(limiter: RateLimiterMySQL, key: string): Promise<RateLimiterRes | null> {
  for (let attempt = 1; ; attempt++) {
    try {
      await limiter.consume(key)
      return null
    }
    catch (error) {
      if (error instanceof RateLimiterRes) return error
      if (!isDeadlock(error) || attempt >= 5) throw error
    }
  }
}

function tooManyAttempts(event: H3Event, ms: number, field: string) {
  const seconds = Math.max(1, Math.ceil(ms / 1000))
  setResponseHeader(event, 'Retry-After', seconds)
  return createError({
    statusCode: 429,
    statusMessage: 'Too many failed sign-ins',
    data: { retryAfterSeconds: seconds, errors: [{ path: field, message: `too many failed attempts: try again in ${Math.ceil(seconds / 60)} minute(s), or reset the password` }] },
  })
}

export interface PasswordAttempt {
  /** The password was right: the points taken for this attempt are given back. */
  succeeded: () => Promise<void>
}

/**
 * Takes a point from both limits for a password check of `email` from this request's address,
 * or throws 429 (with Retry-After) when either is spent; call it before the check, and
 * `succeeded()` after a right password. A wrong one keeps its points. `field` names the form
 * field the 429 is reported on.
 */
export async function beginPasswordAttempt(event: H3Event, email: string, field = 'password'): Promise<PasswordAttempt> {
  const ip = getRequestIP(event) ?? 'unknown'
  const pairKey = signInLimitKey(email, ip)
  const addressKey = hashed(`address\n${ip}`)
  const pair = signInLimiter()
  const address = addressLimiter()
  const spentPair = await consume(pair, pairKey)
  if (spentPair) throw tooManyAttempts(event, spentPair.msBeforeNext, field)
  const spentAddress = await consume(address, addressKey)
  if (spentAddress) {
    // this password is not checked, so it is not counted as a failure for the e-mail either
    await pair.reward(pairKey, 1)
    throw tooManyAttempts(event, spentAddress.msBeforeNext, field)
  }
  return {
    succeeded: async () => {
      await pair.delete(pairKey)
      await address.reward(addressKey, 1)
    },
  }
}
