import type { Knex } from 'knex'
import type { Operation } from '#shared/catalog'
import type { ColourInput } from '#shared/schemas/catalog'
import { Conflict, NotFound } from '../../utils/errors'
import { camelRow, nowIso, snakeRow } from '../../utils/rows'
import { insertedId } from '../../../db/dialect'

export interface OperationColour extends ColourInput {
  id: number
  operation: Operation
}

export async function listColours(db: Knex): Promise<OperationColour[]> {
  return (await db('operation_colours').orderBy(['operation', 'label'])).map((row) => camelRow<OperationColour>(row))
}

async function getColour(db: Knex, id: number): Promise<OperationColour> {
  const row = await db('operation_colours').where({ id }).first()
  if (!row) throw new NotFound('No such colour.')
  return camelRow<OperationColour>(row)
}

async function assertHexFree(db: Knex, hex: string, exceptId = 0) {
  if (await db('operation_colours').where({ hex }).whereNot({ id: exceptId }).first()) {
    throw new Conflict(`${hex} is already mapped.`, { fields: { hex: 'Already mapped to an operation.' } })
  }
}

export async function createColour(db: Knex, input: ColourInput): Promise<OperationColour> {
  await assertHexFree(db, input.hex)
  const id = await insertedId(db('operation_colours').insert(snakeRow({ ...input })))
  return getColour(db, id)
}

export async function updateColour(db: Knex, id: number, change: Partial<ColourInput>): Promise<OperationColour> {
  await getColour(db, id)
  if (change.hex) await assertHexFree(db, change.hex, id)
  await db('operation_colours').where({ id }).update({ ...snakeRow({ ...change }), updated_at: nowIso() })
  return getColour(db, id)
}

export async function deleteColour(db: Knex, id: number): Promise<void> {
  await getColour(db, id)
  await db('operation_colours').where({ id }).delete()
}
