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
    sessionVersion: number
  }
}

export {}
