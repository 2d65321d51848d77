import type { SessionUser } from '#shared/schemas/account'

/** Where to go after signing in: the page asked for (a local path only), else the user's home. */
export function pageAfterSignIn(next: unknown, user: SessionUser | null): string {
  if (typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/\\')) return next
  return user?.role === 'admin' ? '/admin/users' : '/banks'
}
