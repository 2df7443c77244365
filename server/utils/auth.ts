import type { H3Event } from 'h3'
import type { Role, SessionUser } from '#shared/roles'
import { Forbidden, Unauthorized } from './errors'
import { endSession, liveSessionUser, startSession } from './sessions'

interface KerfbookSession {
  user?: SessionUser
  secure?: { sessionId?: string }
}

async function readSession(event: H3Event): Promise<KerfbookSession> {
  return (await getUserSession(event)) as KerfbookSession
}

/** The id of the request's session (its row in user_sessions), if it has one. */
export async function currentSessionId(event: H3Event): Promise<string | undefined> {
  return (await readSession(event)).secure?.sessionId
}

/**
 * The guard of every non-public route: a live session of an enabled account with one of `roles`.
 * The session's row and the role are read from the database, not the cookie, so a sign-out elsewhere,
 * a password change, a role change or a disabled account take effect on the next request.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionUser> {
  const session = await readSession(event)
  if (!session.user) throw new Unauthorized()
  const sessionId = session.secure?.sessionId
  const user = sessionId ? await liveSessionUser(useDb(), sessionId, session.user.id) : undefined
  if (!user) {
    await clearUserSession(event)
    throw new Unauthorized('Your session has ended. Please sign in again.')
  }
  if (roles.length > 0 && !roles.includes(user.role)) throw new Forbidden()
  return user
}

/** Any signed-in user. */
export function requireUser(event: H3Event): Promise<SessionUser> {
  return requireRole(event)
}

/** Signs the browser in as `user` with a new session (never one the browser brought along). */
export async function beginUserSession(event: H3Event, user: SessionUser): Promise<void> {
  const sessionId = await startSession(useDb(), user.id)
  await replaceUserSession(event, { user, secure: { sessionId } })
}

/** Ends this browser's session: its row goes, so a copy of the cookie is worthless too. */
export async function endUserSession(event: H3Event): Promise<void> {
  const sessionId = await currentSessionId(event)
  if (sessionId) await endSession(useDb(), sessionId)
  await clearUserSession(event)
}
