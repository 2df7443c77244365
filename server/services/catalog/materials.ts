import type { Knex } from 'knex'
import type { Role } from '#shared/roles'
import { CUTTER_KINDS, type CutterKind, type MaterialFamily } from '#shared/catalog'
import type { MaterialInput } from '#shared/schemas/catalog'
import { Conflict, Forbidden, InvalidInput, NotFound } from '../../utils/errors'
import { camelRow, nowIso } from '../../utils/rows'

export interface SheetSize {
  id: number
  widthMm: number
  heightMm: number
  priceMinor: number
  currency: string
}

export interface CutterKindRule {
  cutterKind: CutterKind
  allowed: boolean
  reason: string
}

export interface Material {
  id: number
  name: string
  family: MaterialFamily
  thicknessMm: number
  hazardNote: string
  archived: boolean
  sheets: SheetSize[]
  /** One rule per cutter kind; a kind with no stored rule is allowed. */
  rules: CutterKindRule[]
}

async function withDetails(db: Knex, rows: Record<string, unknown>[]): Promise<Material[]> {
  const ids = rows.map((r) => r.id as number)
  const sheets = await db('material_sheets').whereIn('material_id', ids).orderBy(['width_mm', 'height_mm'])
  const rules = await db('material_cutter_rules').whereIn('material_id', ids)
  return rows.map((row) => {
    const own = rules.filter((r) => r.material_id === row.id)
    return {
      ...camelRow<Omit<Material, 'sheets' | 'rules' | 'archived'>>(row),
      archived: !!row.archived,
      sheets: sheets
        .filter((s) => s.material_id === row.id)
        .map((s) => ({ id: s.id, widthMm: s.width_mm, heightMm: s.height_mm, priceMinor: s.price_minor, currency: s.currency })),
      rules: CUTTER_KINDS.map((kind) => {
        const rule = own.find((r) => r.cutter_kind === kind)
        return { cutterKind: kind, allowed: rule ? !!rule.allowed : true, reason: rule?.reason ?? '' }
      }),
    }
  })
}

export async function listMaterials(db: Knex, options: { includeArchived?: boolean } = {}): Promise<Material[]> {
  const query = db('materials').orderBy(['family', 'name', 'thickness_mm'])
  if (!options.includeArchived) query.where({ archived: false })
  return withDetails(db, await query)
}

export async function getMaterial(db: Knex, id: number): Promise<Material> {
  const row = await db('materials').where({ id }).first()
  if (!row) throw new NotFound('No such material.')
  return (await withDetails(db, [row]))[0]!
}

/** Server-side rule behind every place a material meets a cutter: refuses a disallowed pair with its reason. */
export async function assertMaterialAllowedOn(db: Knex, materialId: number, cutterKind: CutterKind): Promise<Material> {
  const material = await getMaterial(db, materialId)
  const rule = material.rules.find((r) => r.cutterKind === cutterKind)
  if (rule && !rule.allowed) {
    throw new InvalidInput(`${material.name} may not be cut on this kind of cutter: ${rule.reason}`, {
      fields: { materialId: rule.reason },
      reason: rule.reason,
    })
  }
  return material
}

async function writeDetails(trx: Knex, materialId: number, input: Partial<MaterialInput>) {
  if (input.sheets) {
    await trx('material_sheets').where({ material_id: materialId }).delete()
    await trx('material_sheets').insert(
      input.sheets.map((s) => ({ material_id: materialId, width_mm: s.widthMm, height_mm: s.heightMm, price_minor: s.priceMinor, currency: s.currency })),
    )
  }
  if (input.rules) {
    await trx('material_cutter_rules').where({ material_id: materialId }).delete()
    if (input.rules.length > 0) {
      await trx('material_cutter_rules').insert(
        input.rules.map((r) => ({ material_id: materialId, cutter_kind: r.cutterKind, allowed: r.allowed, reason: r.allowed ? '' : r.reason })),
      )
    }
  }
}

/** True when `after` sets a price that `before` did not have for that sheet size (a new size at price 0 is no change). */
function changesSheetPrices(before: { widthMm: number; heightMm: number; priceMinor: number }[], after: { widthMm: number; heightMm: number; priceMinor: number }[]) {
  const priceBefore = new Map(before.map((s) => [`${s.widthMm}x${s.heightMm}`, s.priceMinor]))
  return after.some((s) => (priceBefore.get(`${s.widthMm}x${s.heightMm}`) ?? 0) !== s.priceMinor)
}

export async function createMaterial(db: Knex, role: Role, input: MaterialInput): Promise<Material> {
  if (role !== 'admin' && changesSheetPrices([], input.sheets)) {
    throw new Forbidden('Only an admin can set sheet prices; add the material with price 0 and ask an admin.')
  }
  const id = await db.transaction(async (trx) => {
    if (await trx('materials').where({ name: input.name, thickness_mm: input.thicknessMm }).first()) {
      throw new Conflict(`${input.name} at ${input.thicknessMm} mm already exists.`, { fields: { name: 'Already in the catalog at this thickness.' } })
    }
    const [materialId] = await trx('materials').insert({ name: input.name, family: input.family, thickness_mm: input.thicknessMm, hazard_note: input.hazardNote })
    await writeDetails(trx, materialId!, input)
    return materialId!
  })
  return getMaterial(db, id)
}

export async function updateMaterial(db: Knex, role: Role, id: number, change: Partial<MaterialInput>): Promise<Material> {
  const before = await getMaterial(db, id)
  if (role !== 'admin' && change.sheets && changesSheetPrices(before.sheets, change.sheets)) {
    throw new Forbidden('Only an admin can change sheet prices.')
  }
  if (change.thicknessMm !== undefined && change.thicknessMm !== before.thicknessMm) {
    const thinKerf = await db('process_settings').where({ material_id: id }).where('kerf_mm', '>=', change.thicknessMm).first()
    if (thinKerf) throw new InvalidInput('A process setting has a kerf as wide as the new thickness; fix the setting first.', { fields: { thicknessMm: 'Thinner than a process setting’s kerf.' } })
  }
  await db.transaction(async (trx) => {
    const patch: Record<string, unknown> = { updated_at: nowIso() }
    if (change.name !== undefined) patch.name = change.name
    if (change.family !== undefined) patch.family = change.family
    if (change.thicknessMm !== undefined) patch.thickness_mm = change.thicknessMm
    if (change.hazardNote !== undefined) patch.hazard_note = change.hazardNote
    await trx('materials').where({ id }).update(patch)
    await writeDetails(trx, id, change)
  })
  return getMaterial(db, id)
}

/** A material with process settings is archived, not deleted, so old jobs keep their meaning. */
export async function removeMaterial(db: Knex, id: number): Promise<{ archived: boolean }> {
  await getMaterial(db, id)
  if (await db('process_settings').where({ material_id: id }).first()) {
    await db('materials').where({ id }).update({ archived: true, updated_at: nowIso() })
    return { archived: true }
  }
  await db('materials').where({ id }).delete()
  return { archived: false }
}
