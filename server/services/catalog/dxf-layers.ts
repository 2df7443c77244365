import type { Knex } from 'knex'
import type { Operation } from '#shared/catalog'
import type { DxfLayerInput } from '#shared/schemas/catalog'
import { Conflict, NotFound } from '../../utils/errors'
import { camelRow, nowIso } from '../../utils/rows'
import { insertedId } from '../../../db/dialect'

export interface DxfLayerOperation {
  id: number
  layer: string
  operation: Operation
}

export async function listDxfLayers(db: Knex): Promise<DxfLayerOperation[]> {
  return (await db('dxf_layer_operations').orderBy('layer')).map((row) => camelRow<DxfLayerOperation>(row))
}

async function assertLayerFree(db: Knex, layer: string, exceptId = 0) {
  const clash = await db('dxf_layer_operations').whereRaw('lower(layer) = lower(?)', [layer]).whereNot({ id: exceptId }).first()
  if (clash) throw new Conflict(`Layer "${layer}" is already mapped.`, { fields: { layer: 'Already mapped.' } })
}

export async function createDxfLayer(db: Knex, input: DxfLayerInput): Promise<DxfLayerOperation> {
  await assertLayerFree(db, input.layer)
  const id = await insertedId(db('dxf_layer_operations').insert({ layer: input.layer, operation: input.operation }))
  return camelRow<DxfLayerOperation>(await db('dxf_layer_operations').where({ id }).first())
}

export async function updateDxfLayer(db: Knex, id: number, change: Partial<DxfLayerInput>): Promise<DxfLayerOperation> {
  if (!(await db('dxf_layer_operations').where({ id }).first())) throw new NotFound('No such layer mapping.')
  if (change.layer) await assertLayerFree(db, change.layer, id)
  await db('dxf_layer_operations').where({ id }).update({ ...change, updated_at: nowIso() })
  return camelRow<DxfLayerOperation>(await db('dxf_layer_operations').where({ id }).first())
}

export async function deleteDxfLayer(db: Knex, id: number): Promise<void> {
  if ((await db('dxf_layer_operations').where({ id }).delete()) === 0) throw new NotFound('No such layer mapping.')
}
