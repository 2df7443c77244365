import type { Knex } from 'knex'
import type { SignOffInput } from '#shared/schemas/catalog'
import { Conflict, InvalidInput, NotFound } from '../../utils/errors'
import { nowIso } from '../../utils/rows'
import { getCutter } from './cutters'
import { insertedId } from '../../../db/dialect'

export interface SignOff {
  id: number
  userId: number
  userName: string
  cutterId: number
  cutterName: string
  signedOffOn: string
  signedOffByName: string
  expiresOn: string | null
  revokedAt: string | null
  note: string
  /** Valid today: not revoked and not expired. */
  valid: boolean
}

const today = () => new Date().toISOString().slice(0, 10)

function baseQuery(db: Knex) {
  return db('sign_offs as s')
    .join('users as u', 'u.id', 's.user_id')
    .join('cutters as c', 'c.id', 's.cutter_id')
    .join('users as by', 'by.id', 's.signed_off_by')
    .select('s.*', 'u.name as user_name', 'c.name as cutter_name', 'by.name as signed_off_by_name')
    .orderBy([{ column: 'c.name' }, { column: 'u.name' }, { column: 's.signed_off_on', order: 'desc' }])
}

/** A sign_offs row with the names baseQuery joins to it. */
interface SignOffRow {
  id: number
  user_id: number
  user_name: string
  cutter_id: number
  cutter_name: string
  signed_off_on: string
  signed_off_by_name: string
  expires_on: string | null
  revoked_at: string | null
  note: string
}

function toSignOff(row: SignOffRow, on = today()): SignOff {
  return {
    id: row.id,
    userId: row.user_id,
    userName: row.user_name,
    cutterId: row.cutter_id,
    cutterName: row.cutter_name,
    signedOffOn: row.signed_off_on,
    signedOffByName: row.signed_off_by_name,
    expiresOn: row.expires_on,
    revokedAt: row.revoked_at,
    note: row.note,
    valid: !row.revoked_at && (!row.expires_on || row.expires_on >= on),
  }
}

export async function listSignOffs(db: Knex, filter: { userId?: number; cutterId?: number; includeRevoked?: boolean } = {}): Promise<SignOff[]> {
  const query = baseQuery(db)
  if (filter.userId) query.where('s.user_id', filter.userId)
  if (filter.cutterId) query.where('s.cutter_id', filter.cutterId)
  if (!filter.includeRevoked) query.whereNull('s.revoked_at')
  return (await query).map((row) => toSignOff(row))
}

/** The rule booking relies on: a member may use a cutter only with a valid sign-off on `onDate`. */
export async function hasValidSignOff(db: Knex, userId: number, cutterId: number, onDate = today()): Promise<boolean> {
  const rows = await db('sign_offs').where({ user_id: userId, cutter_id: cutterId }).whereNull('revoked_at')
  return rows.some((r) => r.signed_off_on <= onDate && (!r.expires_on || r.expires_on >= onDate))
}

export async function recordSignOff(db: Knex, staffId: number, input: SignOffInput): Promise<SignOff> {
  await getCutter(db, input.cutterId)
  const member = await db('users').where({ id: input.userId }).first()
  if (!member) throw new NotFound('No such member.')
  if (input.signedOffOn > today()) throw new InvalidInput('The induction date cannot be in the future.', { fields: { signedOffOn: 'Cannot be in the future.' } })
  if (await hasValidSignOff(db, input.userId, input.cutterId)) {
    throw new Conflict(`${member.name} already holds a valid sign-off for this cutter. Revoke it first to record a new one.`)
  }
  const id = await insertedId(db('sign_offs').insert({
    user_id: input.userId,
    cutter_id: input.cutterId,
    signed_off_on: input.signedOffOn,
    signed_off_by: staffId,
    expires_on: input.expiresOn,
    note: input.note,
  }))
  return toSignOff(await baseQuery(db).where('s.id', id).first())
}

export async function revokeSignOff(db: Knex, staffId: number, id: number): Promise<SignOff> {
  const row = await db('sign_offs').where({ id }).first()
  if (!row) throw new NotFound('No such sign-off.')
  if (row.revoked_at) throw new Conflict('This sign-off was already revoked.')
  const now = nowIso()
  await db('sign_offs').where({ id }).update({ revoked_at: now, revoked_by: staffId, updated_at: now })
  return toSignOff(await baseQuery(db).where('s.id', id).first())
}
