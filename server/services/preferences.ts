import type { Knex } from 'knex'
import type { LengthUnit } from '#shared/units'
import { nowIso } from '../utils/rows'

// What a person chose for how Kerfbook shows things to them.

export async function lengthUnitOf(db: Knex, userId: number): Promise<LengthUnit> {
  const row = await db('users').where({ id: userId }).first('length_unit')
  return (row?.length_unit as LengthUnit | undefined) ?? 'mm'
}

export async function setLengthUnit(db: Knex, userId: number, unit: LengthUnit): Promise<LengthUnit> {
  await db('users').where({ id: userId }).update({ length_unit: unit, updated_at: nowIso() })
  return unit
}
