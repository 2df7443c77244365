import { createHash, randomBytes } from 'node:crypto'
import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'

// Sessions as rows (the server's half of the cookie, read by the auth guard on every request): the cookie holds a random session id, the database only its SHA-256, and a request is
// signed in only while the row exists. Ending a session is deleting its row; the cookie is then worthless.
export const SESSION_TTL_MS = 14 * 24 * 3600_000

function hashSessionId(sessionId: string): string {
  return createHash('sha256').update(sessionId).digest('hex')
}

/** A new session for `userId`; returns the id the cookie keeps. The user's expired rows go at the same time. */
export async function startSession(db: Knex, userId: number, now = new Date()): Promise<string> {
  const sessionId = randomBytes(32).toString('base64url')
  await db('user_sessions').where({ user_id: userId }).where('expires_at', '<=', now.toISOString()).delete()
  await db('user_sessions').insert({ id_hash: hashSessionId(sessionId), user_id: userId, expires_at: new Date(now.getTime() + SESSION_TTL_MS).toISOString() })
  return sessionId
}

/** Whether the session is live and belongs to `userId`. */
export async function sessionIsLive(db: Knex, sessionId: string, userId: number, now = new Date()): Promise<boolean> {
  const row = await db('user_sessions').where({ id_hash: hashSessionId(sessionId), user_id: userId }).where('expires_at', '>', now.toISOString()).first('user_id')
  return !!row
}

/** The account of a live session, if it is enabled: what the auth guard lets through. One query. */
export async function liveSessionUser(db: Knex, sessionId: string, userId: number, now = new Date()): Promise<SessionUser | undefined> {
  return db('user_sessions as s')
    .join('users as u', 'u.id', 's.user_id')
    .where({ 's.id_hash': hashSessionId(sessionId), 's.user_id': userId })
    .where('s.expires_at', '>', now.toISOString())
    .whereNull('u.disabled_at')
    .first<SessionUser | undefined>('u.id', 'u.email', 'u.name', 'u.role')
}

export async function endSession(db: Knex, sessionId: string): Promise<void> {
  await db('user_sessions').where({ id_hash: hashSessionId(sessionId) }).delete()
}

/** Ends every session of the user, or every one but `keepSessionId` (the browser that made the change). */
export async function endAllSessions(db: Knex, userId: number, keepSessionId?: string): Promise<void> {
  const query = db('user_sessions').where({ user_id: userId })
  if (keepSessionId) query.whereNot({ id_hash: hashSessionId(keepSessionId) })
  await query.delete()
}
