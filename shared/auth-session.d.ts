import type { SessionUser } from './roles'
import type { LengthUnit } from './units'

// What the session cookie holds and GET /api/_auth/session answers (server/plugins/session-check.ts adds the
// person's length unit), as useUserSession() and getUserSession() type it.
declare module '#auth-utils' {
  interface User extends SessionUser {
    lengthUnit?: LengthUnit
  }
  interface SecureSessionData {
    sessionId?: string
  }
}

export {}
