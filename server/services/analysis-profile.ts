import type { Knex } from 'knex'
import { DEFAULT_ANALYSIS_PARAMS, withDefaults, type AnalysisParams } from '../analysis/index'
import { InvalidInput } from '../utils/errors'
import { listColours } from './catalog/colours'
import { listDxfLayers } from './catalog/dxf-layers'
import { getCutter } from './catalog/cutters'
import { assertMaterialAllowedOn } from './catalog/materials'
import { findProcessSetting } from './catalog/process-settings'

export interface ProfileChoice {
  cutterId: number
  materialId: number
  /** A stock sheet of the material; its first sheet when absent. */
  sheetId?: number
}

/** The engine's parameters for a cutter × material from the catalog; refuses pairs that can't be cut here. */
export async function analysisParamsFor(db: Knex, choice: ProfileChoice): Promise<AnalysisParams> {
  const cutter = await getCutter(db, choice.cutterId)
  if (cutter.status === 'retired') throw new InvalidInput(`${cutter.name} is retired.`, { fields: { cutterId: 'Retired.' } })
  const material = await assertMaterialAllowedOn(db, choice.materialId, cutter.kind)
  const setting = await findProcessSetting(db, cutter.id, material.id)
  if (!setting) {
    throw new InvalidInput(`${material.name} ${material.thicknessMm} mm is not cuttable on ${cutter.name}: the workshop has no process setting for it.`, {
      fields: { materialId: 'Not cuttable on this cutter.' },
    })
  }
  const sheet = choice.sheetId ? material.sheets.find((s) => s.id === choice.sheetId) : material.sheets[0]
  if (!sheet) throw new InvalidInput('That sheet size is not stocked for this material.', { fields: { sheetId: 'Not a stock size of this material.' } })
  const [colours, layers] = await Promise.all([listColours(db), listDxfLayers(db)])
  return withDefaults({
    // The process speed is capped by what the machine can do.
    cutSpeedMmPerMin: Math.min(setting.cutSpeedMmPerMin, cutter.maxSpeedMmPerMin),
    scoreSpeedMmPerMin: Math.min(setting.scoreSpeedMmPerMin, cutter.maxSpeedMmPerMin),
    engraveSpeedMmPerMin: setting.engraveSpeedMmPerMin,
    engraveLineSpacingMm: setting.engraveLineIntervalMm,
    accelMmPerS2: cutter.accelMmPerS2,
    rapidSpeedMmPerMin: cutter.rapidMmPerMin,
    junctionDeviationMm: cutter.junctionDeviationMm,
    pierceTimeS: setting.pierceS + cutter.pierceOverheadS,
    kerfMm: setting.kerfMm,
    thicknessMm: material.thicknessMm,
    cutterMaxThicknessMm: cutter.maxThicknessMm,
    materialAllowed: { allowed: true, reason: '' },
    minBridgeMm: setting.minBridgeMm,
    minHoleMm: setting.minHoleMm,
    sheetWidthMm: sheet.widthMm,
    sheetHeightMm: sheet.heightMm,
    bedWidthMm: cutter.bedWidthMm,
    bedHeightMm: cutter.bedHeightMm,
    setupTimeS: cutter.setupMinutes * 60,
    pricePerMinuteMinor: cutter.pricePerMinuteMinor,
    currency: cutter.currency,
    billingIncrementMinutes: cutter.billingIncrementMinutes,
    materialPriceMinorPerM2: sheet.priceMinor / ((sheet.widthMm * sheet.heightMm) / 1e6),
    dxfLayerMapping: layers.map((l) => ({ layer: l.layer, operation: l.operation })),
    colourMapping: colours.length
      ? colours.map((c) => ({ hex: c.hex, toleranceRgbDistance: c.tolerance, operation: c.operation }))
      : DEFAULT_ANALYSIS_PARAMS.colourMapping,
  })
}
