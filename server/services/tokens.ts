import { createHash, randomBytes } from 'node:crypto'
import type { Knex } from 'knex'
import { InvalidInput } from '../utils/errors'

export type TokenPurpose = 'verify-email' | 'reset-password'

export const TOKEN_TTL_MS: Record<TokenPurpose, number> = {
  'verify-email': 48 * 3600_000,
  'reset-password': 3600_000,
}

function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/** A random one-time token; only its SHA-256 is stored, so a leaked database yields no usable links. */
export async function issueToken(trx: Knex, userId: number, purpose: TokenPurpose, now = new Date()): Promise<string> {
  const token = randomBytes(32).toString('base64url')
  // A new link replaces any older one of the same purpose.
  await revokeTokens(trx, userId, purpose, now)
  await trx('auth_tokens').insert({
    user_id: userId,
    purpose,
    token_hash: hashToken(token),
    expires_at: new Date(now.getTime() + TOKEN_TTL_MS[purpose]).toISOString(),
  })
  return token
}

/** Makes every unused link of this purpose worthless, e.g. reset links once the password has changed. */
export async function revokeTokens(trx: Knex, userId: number, purpose: TokenPurpose, now = new Date()): Promise<void> {
  await trx('auth_tokens').where({ user_id: userId, purpose }).whereNull('used_at').update({ used_at: now.toISOString(), updated_at: now.toISOString() })
}

/** Marks the token used and returns its user; refuses used, expired and unknown tokens alike. */
export async function consumeToken(trx: Knex, purpose: TokenPurpose, token: string, now = new Date()): Promise<number> {
  const nowIso = now.toISOString()
  const row = await trx('auth_tokens').where({ token_hash: hashToken(token), purpose }).first()
  if (!row || row.used_at || row.expires_at <= nowIso) {
    throw new InvalidInput('This link is invalid, already used or expired. Ask for a new one.')
  }
  const changed = await trx('auth_tokens').where({ id: row.id }).whereNull('used_at').update({ used_at: nowIso, updated_at: nowIso })
  if (changed !== 1) throw new InvalidInput('This link is invalid, already used or expired. Ask for a new one.')
  return row.user_id as number
}
