import type { Knex } from 'knex'
import type { Role } from '#shared/roles'
import type { CutterKind, CutterStatus } from '#shared/catalog'
import { CUTTER_PRICE_FIELDS, type CutterInput } from '#shared/schemas/catalog'
import { Conflict, Forbidden, NotFound } from '../../utils/errors'
import { camelRow, nowIso, snakeRow } from '../../utils/rows'
import { insertedId } from '../../../db/dialect'

export interface Cutter extends CutterInput {
  id: number
  kind: CutterKind
  status: CutterStatus
  createdAt: string
  updatedAt: string
}

export async function listCutters(db: Knex, options: { includeRetired?: boolean } = {}): Promise<Cutter[]> {
  const query = db('cutters').orderBy('name')
  if (!options.includeRetired) query.whereNot({ status: 'retired' })
  return (await query).map((row) => camelRow<Cutter>(row))
}

export async function getCutter(db: Knex, id: number): Promise<Cutter> {
  const row = await db('cutters').where({ id }).first()
  if (!row) throw new NotFound('No such cutter.')
  return camelRow<Cutter>(row)
}

function assertMayChangePrices(role: Role, change: Partial<CutterInput>, before?: Cutter) {
  if (role === 'admin') return
  const touched = CUTTER_PRICE_FIELDS.filter((f) => change[f] !== undefined && (!before || change[f] !== before[f]))
  if (touched.length > 0) throw new Forbidden(`Only an admin can set prices (${touched.join(', ')}).`)
}

async function assertNameFree(db: Knex, name: string, exceptId?: number) {
  const clash = await db('cutters').where({ name }).whereNot({ id: exceptId ?? 0 }).first()
  if (clash) throw new Conflict(`A cutter named "${name}" already exists.`, { fields: { name: 'Already used by another cutter.' } })
}

export async function createCutter(db: Knex, role: Role, input: CutterInput): Promise<Cutter> {
  if (role !== 'admin') throw new Forbidden('Only an admin can add a cutter, because it sets a price.')
  await assertNameFree(db, input.name)
  const id = await insertedId(db('cutters').insert(snakeRow({ ...input })))
  return getCutter(db, id)
}

export async function updateCutter(db: Knex, role: Role, id: number, change: Partial<CutterInput>): Promise<Cutter> {
  const before = await getCutter(db, id)
  assertMayChangePrices(role, change, before)
  if (change.name) await assertNameFree(db, change.name, id)
  if (change.kind && change.kind !== before.kind) {
    const disallowed = await db('process_settings as p')
      .join('material_cutter_rules as r', 'r.material_id', 'p.material_id')
      .where({ 'p.cutter_id': id, 'r.cutter_kind': change.kind, 'r.allowed': false })
      .first('r.reason')
    if (disallowed) throw new Conflict(`This cutter has settings for a material not allowed on that kind: ${disallowed.reason}`)
  }
  await db('cutters').where({ id }).update({ ...snakeRow({ ...change }), updated_at: nowIso() })
  return getCutter(db, id)
}

// Every table that points at a cutter (add jobs and bookings here as they land): what refers to it is history.
const CUTTER_REFERENCES = [
  { table: 'sign_offs', column: 'cutter_id', what: 'sign-offs' },
  { table: 'process_settings', column: 'cutter_id', what: 'process settings' },
  { table: 'jobs', column: 'cutter_id', what: 'jobs' },
  { table: 'bookings', column: 'cutter_id', what: 'bookings' },
]

/** Deletes a cutter nothing refers to; a cutter with history is refused, so nothing is lost: retire it instead. */
export async function deleteCutter(db: Knex, role: Role, id: number): Promise<void> {
  if (role !== 'admin') throw new Forbidden('Only an admin can remove a cutter.')
  await db.transaction(async (trx) => {
    await getCutter(trx, id)
    const uses: string[] = []
    for (const ref of CUTTER_REFERENCES) {
      if (await trx(ref.table).where(ref.column, id).first()) uses.push(ref.what)
    }
    if (uses.length > 0) {
      throw new Conflict(`This cutter has ${uses.join(' and ')} that must be kept. Set its status to retired instead.`, { uses })
    }
    await trx('opening_hours').where({ cutter_id: id }).delete()
    await trx('closures').where({ cutter_id: id }).delete()
    await trx('cutters').where({ id }).delete()
  })
}
