import type { H3Event } from 'h3'
import type { Role, SessionUser } from '#shared/roles'
import { Forbidden, Unauthorized } from './errors'
import { findActiveUser } from '../services/accounts'

/**
 * The guard of every non-public route: a signed-in, enabled account with one of `roles`.
 * The role is read from the database, not the cookie, so a role change or a disabled
 * account takes effect on the next request.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<SessionUser> {
  const session = await getUserSession(event)
  const sessionUser = session.user as SessionUser | undefined
  if (!sessionUser) throw new Unauthorized()
  const user = await findActiveUser(useDb(), sessionUser.id)
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
