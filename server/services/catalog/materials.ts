import type { Knex } from 'knex'
import type { Role } from '#shared/roles'
import { CUTTER_KINDS, type CutterKind, type MaterialFamily } from '#shared/catalog'
import type { MaterialInput } from '#shared/schemas/catalog'
import { Conflict, Forbidden, InvalidInput, NotFound } from '../../utils/errors'
import { camelRow, nowIso } from '../../utils/rows'
import { insertedId } from '../../../db/dialect'

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

type SheetInput = MaterialInput['sheets'][number]

/**
 * Pairs each sheet of an edit with the stock sheet it changes: by id, else by its exact size; unpaired ones are new.
 * Jobs refer to stock sheets by id, so an edit updates rows in place instead of replacing them.
 */
function pairSheets(before: SheetSize[], after: SheetInput[]): { sheet: SheetInput; existing: SheetSize | null }[] {
  const unclaimed = new Map(before.map((s) => [s.id, s]))
  const byId = after.map((sheet) => {
    const existing = sheet.id !== undefined ? (unclaimed.get(sheet.id) ?? null) : null
    if (sheet.id !== undefined && !existing) throw new InvalidInput('That stock sheet is not one of this material’s.', { fields: { sheets: 'Unknown stock sheet.' } })
    if (existing) unclaimed.delete(existing.id)
    return { sheet, existing }
  })
  return byId.map(({ sheet, existing }) => {
    if (existing) return { sheet, existing }
    const sameSize = [...unclaimed.values()].find((s) => s.widthMm === sheet.widthMm && s.heightMm === sheet.heightMm) ?? null
    if (sameSize) unclaimed.delete(sameSize.id)
    return { sheet, existing: sameSize }
  })
}

/** True when the edit sets a price or currency a stock sheet did not have (a new sheet at price 0 sets no price). */
function changesSheetPrices(pairs: { sheet: SheetInput; existing: SheetSize | null }[]): boolean {
  return pairs.some(({ sheet, existing }) =>
    existing ? existing.priceMinor !== sheet.priceMinor || existing.currency !== sheet.currency : sheet.priceMinor !== 0,
  )
}

async function writeSheets(trx: Knex, materialId: number, pairs: { sheet: SheetInput; existing: SheetSize | null }[], before: SheetSize[]) {
  const kept = new Set(pairs.flatMap((p) => (p.existing ? [p.existing.id] : [])))
  const removed = before.filter((s) => !kept.has(s.id)).map((s) => s.id)
  if (removed.length > 0) {
    const used = await trx('jobs').whereIn('sheet_id', removed).count({ n: '*' }).first()
    if (Number(used?.n) > 0) throw new Conflict('A stock sheet you removed is used by jobs; keep it (change its size or price instead).', { fields: { sheets: 'A removed sheet is used by jobs.' } })
    await trx('material_sheets').whereIn('id', removed).delete()
  }
  for (const { sheet, existing } of pairs) {
    const row = { width_mm: sheet.widthMm, height_mm: sheet.heightMm, price_minor: sheet.priceMinor, currency: sheet.currency }
    if (existing) await trx('material_sheets').where({ id: existing.id }).update(row)
    else await trx('material_sheets').insert({ material_id: materialId, ...row })
  }
}

async function writeRules(trx: Knex, materialId: number, input: Partial<MaterialInput>) {
  if (input.rules) {
    await trx('material_cutter_rules').where({ material_id: materialId }).delete()
    if (input.rules.length > 0) {
      await trx('material_cutter_rules').insert(
        input.rules.map((r) => ({ material_id: materialId, cutter_kind: r.cutterKind, allowed: r.allowed, reason: r.allowed ? '' : r.reason })),
      )
    }
  }
}

export async function createMaterial(db: Knex, role: Role, input: MaterialInput): Promise<Material> {
  const pairs = pairSheets([], input.sheets)
  if (role !== 'admin' && changesSheetPrices(pairs)) {
    throw new Forbidden('Only an admin can set sheet prices; add the material with price 0 and ask an admin.')
  }
  const id = await db.transaction(async (trx) => {
    if (await trx('materials').where({ name: input.name, thickness_mm: input.thicknessMm }).first()) {
      throw new Conflict(`${input.name} at ${input.thicknessMm} mm already exists.`, { fields: { name: 'Already in the catalog at this thickness.' } })
    }
    const materialId = await insertedId(trx('materials').insert({ name: input.name, family: input.family, thickness_mm: input.thicknessMm, hazard_note: input.hazardNote }))
    await writeSheets(trx, materialId, pairs, [])
    await writeRules(trx, materialId, input)
    return materialId
  })
  return getMaterial(db, id)
}

export async function updateMaterial(db: Knex, role: Role, id: number, change: Partial<MaterialInput>): Promise<Material> {
  const before = await getMaterial(db, id)
  const pairs = change.sheets ? pairSheets(before.sheets, change.sheets) : null
  if (role !== 'admin' && pairs && changesSheetPrices(pairs)) {
    throw new Forbidden('Only an admin can change sheet prices and currencies.')
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
    if (pairs) await writeSheets(trx, id, pairs, before.sheets)
    await writeRules(trx, id, change)
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
