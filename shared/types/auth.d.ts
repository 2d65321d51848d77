import type { SessionUser } from '../schemas/account'

declare module '#auth-utils' {
  // The session's `user` is exactly SessionUser: { id, role, name }.
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type
  interface User extends SessionUser {}

  interface UserSession {
    loggedInAt?: string
  }

  /** Server-only part of the session (never sent to the browser). */
  interface SecureSessionData {
    /** The `sessions` row this cookie belongs to (revoked at sign-out). */
    sessionId: string
    sessionVersion: number
  }
}

export {}
