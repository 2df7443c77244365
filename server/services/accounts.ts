import type { Knex } from 'knex'
import type { Role, SessionUser } from '#shared/roles'
import { Conflict, Forbidden, InvalidInput, NotFound, Unauthorized } from '../utils/errors'
import { passwordChangedMail, signUpAttemptMail, verificationMail } from './account-mail'
import { endAllSessions } from '../utils/sessions'
import { consumeToken, issueToken, revokeTokens } from './tokens'
import { insertedId } from '../../db/dialect'

export interface UserRow {
  id: number
  email: string
  name: string
  role: Role
  password_hash: string
  email_verified_at: string | null
  disabled_at: string | null
  created_at: string
}

export interface UserListItem extends SessionUser {
  verified: boolean
  disabled: boolean
  createdAt: string
}

const BAD_CREDENTIALS = 'E-mail or password is wrong.'
// Verified against when the e-mail is unknown, so both failures take the same time.
let dummyHash: Promise<string> | undefined

function toSessionUser(row: UserRow): SessionUser {
  return { id: row.id, email: row.email, name: row.name, role: row.role }
}

export function toListItem(row: UserRow): UserListItem {
  return { ...toSessionUser(row), verified: !!row.email_verified_at, disabled: !!row.disabled_at, createdAt: row.created_at }
}

/**
 * Creates a member and mails a confirmation link, or, when the address already has an account, changes nothing and
 * mails its owner that someone tried: the route answers the same either way, so sign-up can't be used to learn who
 * has an account. The password is hashed either way, so both take the same time. The mail commits with the change.
 */
export async function signUp(db: Knex, input: { name: string; email: string; password: string }): Promise<{ created: boolean }> {
  const passwordHash = await hashPassword(input.password)
  return db.transaction(async (trx) => {
    const existing = await trx<UserRow>('users').where({ email: input.email }).first()
    if (existing) {
      await signUpAttemptMail(trx, toSessionUser(existing))
      return { created: false }
    }
    const id = await insertedId(trx('users').insert({ name: input.name, email: input.email, password_hash: passwordHash, role: 'member' }))
    await verificationMail(trx, { id: id, email: input.email, name: input.name, role: 'member' as Role }, await issueToken(trx, id, 'verify-email'))
    return { created: true }
  })
}

export async function verifyEmail(db: Knex, token: string): Promise<SessionUser> {
  return db.transaction(async (trx) => {
    const userId = await consumeToken(trx, 'verify-email', token)
    const now = new Date().toISOString()
    await trx('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: now, updated_at: now })
    const row = await trx<UserRow>('users').where({ id: userId }).first()
    return toSessionUser(row!)
  })
}

/** Checks e-mail and password; unknown e-mail, wrong password and disabled account give one message. */
export async function authenticate(db: Knex, email: string, password: string): Promise<SessionUser> {
  const row = await db<UserRow>('users').where({ email }).first()
  if (!row) {
    dummyHash ??= hashPassword('not-a-real-password')
    await verifyPassword(await dummyHash, password)
    throw new Unauthorized(BAD_CREDENTIALS)
  }
  if (!(await verifyPassword(row.password_hash, password)) || row.disabled_at) throw new Unauthorized(BAD_CREDENTIALS)
  if (!row.email_verified_at) throw new Forbidden('Please confirm your e-mail address first: open the link we sent you.')
  return toSessionUser(row)
}

export async function resetPassword(db: Knex, token: string, newPassword: string): Promise<SessionUser> {
  const passwordHash = await hashPassword(newPassword)
  return db.transaction(async (trx) => {
    const userId = await consumeToken(trx, 'reset-password', token)
    const now = new Date().toISOString()
    // Opening the reset link proves the address, so it also counts as verification.
    await trx('users').where({ id: userId }).update({ password_hash: passwordHash, updated_at: now })
    await trx('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: now })
    // Whoever knew the old password (or holds an old session or link) is out.
    await revokeTokens(trx, userId, 'reset-password')
    await endAllSessions(trx, userId)
    const user = toSessionUser((await trx<UserRow>('users').where({ id: userId }).first())!)
    await passwordChangedMail(trx, user)
    return user
  })
}

/** Changes the password; every other session and every unused reset link of the account ends with the old one. */
export async function changePassword(db: Knex, userId: number, currentPassword: string, newPassword: string, keepSessionId?: string): Promise<void> {
  const row = await db<UserRow>('users').where({ id: userId }).first()
  if (!row) throw new NotFound('Account not found.')
  if (!(await verifyPassword(row.password_hash, currentPassword))) {
    throw new InvalidInput('The current password is wrong.', { fields: { currentPassword: 'This is not your current password.' } })
  }
  const passwordHash = await hashPassword(newPassword)
  await db.transaction(async (trx) => {
    await trx('users').where({ id: userId }).update({ password_hash: passwordHash, updated_at: new Date().toISOString() })
    await revokeTokens(trx, userId, 'reset-password')
    await endAllSessions(trx, userId, keepSessionId)
    await passwordChangedMail(trx, row)
  })
}

export async function listUsers(db: Knex, filter: { role?: Role } = {}): Promise<UserListItem[]> {
  const query = db<UserRow>('users').orderBy('name')
  if (filter.role) query.where({ role: filter.role })
  return (await query).map(toListItem)
}

/** Admin: change a role or disable/enable an account. An admin can't lock themselves out. */
export async function updateUser(db: Knex, actorId: number, userId: number, change: { role?: Role; disabled?: boolean }): Promise<UserListItem> {
  return db.transaction(async (trx) => {
    const row = await trx<UserRow>('users').where({ id: userId }).first()
    if (!row) throw new NotFound('No such account.')
    if (userId === actorId && ((change.role && change.role !== 'admin') || change.disabled)) {
      throw new Conflict('You cannot remove your own admin role or disable your own account.')
    }
    const now = new Date().toISOString()
    const patch: Partial<UserRow> & { updated_at: string } = { updated_at: now }
    if (change.role) patch.role = change.role
    if (change.disabled !== undefined) patch.disabled_at = change.disabled ? (row.disabled_at ?? now) : null
    await trx('users').where({ id: userId }).update(patch)
    // A new role or a disabled account starts from a fresh sign-in on every device.
    if ((change.role && change.role !== row.role) || (change.disabled && !row.disabled_at)) await endAllSessions(trx, userId)
    return toListItem((await trx<UserRow>('users').where({ id: userId }).first())!)
  })
}
