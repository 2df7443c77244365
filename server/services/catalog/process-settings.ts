import type { Knex } from 'knex'
import type { ProcessSettingInput } from '#shared/schemas/catalog'
import { Conflict, InvalidInput, NotFound } from '../../utils/errors'
import { camelRow, nowIso, snakeRow } from '../../utils/rows'
import { getCutter, type Cutter } from './cutters'
import { assertMaterialAllowedOn, type Material } from './materials'
import { insertedId } from '../../../db/dialect'

export interface ProcessSetting extends ProcessSettingInput {
  id: number
  createdAt: string
  updatedAt: string
}

export async function listProcessSettings(db: Knex, filter: { cutterId?: number; materialId?: number } = {}): Promise<ProcessSetting[]> {
  const query = db('process_settings').orderBy(['cutter_id', 'material_id'])
  if (filter.cutterId) query.where({ cutter_id: filter.cutterId })
  if (filter.materialId) query.where({ material_id: filter.materialId })
  return (await query).map((row) => camelRow<ProcessSetting>(row))
}

export async function getProcessSetting(db: Knex, id: number): Promise<ProcessSetting> {
  const row = await db('process_settings').where({ id }).first()
  if (!row) throw new NotFound('No such process setting.')
  return camelRow<ProcessSetting>(row)
}

/** The setting for a cutter × material, or undefined: a missing pair means "not cuttable here". */
export async function findProcessSetting(db: Knex, cutterId: number, materialId: number): Promise<ProcessSetting | undefined> {
  const row = await db('process_settings').where({ cutter_id: cutterId, material_id: materialId }).first()
  return row ? camelRow<ProcessSetting>(row) : undefined
}

function assertPhysicallySound(setting: Pick<ProcessSettingInput, 'kerfMm'>, material: Material, cutter: Cutter) {
  if (material.thicknessMm > cutter.maxThicknessMm) {
    throw new InvalidInput(`${material.name} (${material.thicknessMm} mm) is thicker than ${cutter.name} can cut (${cutter.maxThicknessMm} mm).`, {
      fields: { materialId: `Thicker than this cutter's ${cutter.maxThicknessMm} mm limit.` },
    })
  }
  // A kerf as wide as the sheet is thick is a typo, not a process (common practice, no source).
  if (setting.kerfMm >= material.thicknessMm) {
    throw new InvalidInput(`The kerf (${setting.kerfMm} mm) must be less than the material thickness (${material.thicknessMm} mm).`, {
      fields: { kerfMm: `Must be less than the thickness, ${material.thicknessMm} mm.` },
    })
  }
}

export async function createProcessSetting(db: Knex, input: ProcessSettingInput): Promise<ProcessSetting> {
  const cutter = await getCutter(db, input.cutterId)
  const material = await assertMaterialAllowedOn(db, input.materialId, cutter.kind)
  assertPhysicallySound(input, material, cutter)
  if (await findProcessSetting(db, input.cutterId, input.materialId)) {
    throw new Conflict(`${cutter.name} already has a setting for ${material.name}; edit it instead.`)
  }
  const id = await insertedId(db('process_settings').insert(snakeRow({ ...input })))
  return getProcessSetting(db, id)
}

export async function updateProcessSetting(db: Knex, id: number, change: Partial<ProcessSettingInput>): Promise<ProcessSetting> {
  const before = await getProcessSetting(db, id)
  const cutter = await getCutter(db, before.cutterId)
  const material = await assertMaterialAllowedOn(db, before.materialId, cutter.kind)
  assertPhysicallySound({ kerfMm: change.kerfMm ?? before.kerfMm }, material, cutter)
  await db('process_settings').where({ id }).update({ ...snakeRow({ ...change, cutterId: undefined, materialId: undefined }), updated_at: nowIso() })
  return getProcessSetting(db, id)
}

export async function deleteProcessSetting(db: Knex, id: number): Promise<void> {
  await getProcessSetting(db, id)
  await db('process_settings').where({ id }).delete()
}
