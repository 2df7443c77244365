import type { Knex } from 'knex'
import type { ClosureInput, OpeningHoursInput } from '#shared/schemas/catalog'
import { NotFound } from '../../utils/errors'
import { getCutter } from './cutters'
import { insertedId } from '../../../db/dialect'

export interface OpeningPeriod {
  weekday: number
  opensAt: string
  closesAt: string
}

export interface Closure extends ClosureInput {
  id: number
  createdAt: string
}

export async function listOpeningHours(db: Knex, cutterId: number): Promise<OpeningPeriod[]> {
  await getCutter(db, cutterId)
  const rows = await db('opening_hours').where({ cutter_id: cutterId }).orderBy(['weekday', 'opens_at'])
  return rows.map((r) => ({ weekday: r.weekday, opensAt: r.opens_at, closesAt: r.closes_at }))
}

/** Replaces the cutter's weekly pattern as a whole, in one transaction. */
export async function replaceOpeningHours(db: Knex, cutterId: number, input: OpeningHoursInput): Promise<OpeningPeriod[]> {
  await getCutter(db, cutterId)
  await db.transaction(async (trx) => {
    await trx('opening_hours').where({ cutter_id: cutterId }).delete()
    if (input.hours.length > 0) {
      await trx('opening_hours').insert(input.hours.map((h) => ({ cutter_id: cutterId, weekday: h.weekday, opens_at: h.opensAt, closes_at: h.closesAt })))
    }
  })
  return listOpeningHours(db, cutterId)
}

export async function listClosures(db: Knex, filter: { fromIso?: string } = {}): Promise<Closure[]> {
  const query = db('closures').orderBy('starts_at')
  if (filter.fromIso) query.where('ends_at', '>', filter.fromIso)
  return (await query).map(toClosure)
}

interface ClosureRow {
  id: number
  cutter_id: number | null
  starts_at: string
  ends_at: string
  reason: string
  created_at: string
}

function toClosure(row: ClosureRow): Closure {
  return { id: row.id, cutterId: row.cutter_id, startsAt: row.starts_at, endsAt: row.ends_at, reason: row.reason, createdAt: row.created_at }
}

export async function createClosure(db: Knex, actorId: number, input: ClosureInput): Promise<Closure> {
  if (input.cutterId) await getCutter(db, input.cutterId)
  const id = await insertedId(db('closures').insert({
    cutter_id: input.cutterId,
    starts_at: new Date(input.startsAt).toISOString(),
    ends_at: new Date(input.endsAt).toISOString(),
    reason: input.reason,
    created_by: actorId,
  }))
  return toClosure(await db('closures').where({ id }).first())
}

export async function deleteClosure(db: Knex, id: number): Promise<void> {
  if ((await db('closures').where({ id }).delete()) === 0) throw new NotFound('No such closure.')
}
