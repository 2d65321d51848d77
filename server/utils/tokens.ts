import { createHash, randomBytes } from 'node:crypto'

/** A random token for a link (256 bits, URL-safe). */
export function newLinkToken(): string {
  return randomBytes(32).toString('base64url')
}

/** What we keep of a mailed token: its SHA-256, so a copy of the database opens no link. */
export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}

/** The app's public address (runtime config `public.baseUrl`) joined with a path. */
export function publicUrl(path: string): string {
  const base = String(useRuntimeConfig().public.baseUrl || 'http://localhost:3000').replace(/\/+$/, '')
  return `${base}${path}`
}
