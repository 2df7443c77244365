export type Operation = 'cut' | 'score' | 'engrave' | 'ignore'

/** One entry of the workshop's colour mapping: colours within the tolerance map to the operation. */
export interface ColourRule {
  /** `#rrggbb` */
  hex: string
  /** Largest Euclidean distance in 8-bit sRGB (0–441) that still counts as this colour. */
  toleranceRgbDistance: number
  operation: Operation
}

/** One entry of the workshop's DXF layer mapping: entities on this layer (names compared case-insensitively, as DXF does) get the operation. */
export interface DxfLayerRule {
  layer: string
  operation: Operation
}

/** Everything the engine needs to know about the cutter, the material and the workshop's prices. */
export interface AnalysisParams {
  cutSpeedMmPerMin: number
  scoreSpeedMmPerMin: number
  /** 0 means no acceleration limit: every move runs at full speed. */
  accelMmPerS2: number
  rapidSpeedMmPerMin: number
  /** Cornering tolerance of the motion controller's junction-deviation model. */
  junctionDeviationMm: number
  pierceTimeS: number
  /** Raster engraving: head speed and distance between lines. */
  engraveSpeedMmPerMin: number
  engraveLineSpacingMm: number
  kerfMm: number
  thicknessMm: number
  minBridgeMm: number
  minHoleMm: number
  sheetWidthMm: number
  sheetHeightMm: number
  /** The cutter kind's rule for this material, when the workshop's catalog gives one (absent: not checked). */
  materialAllowed?: { allowed: boolean; reason: string }
  /** Thickest material the cutter can cut (absent: not checked). */
  cutterMaxThicknessMm?: number
  /** Edge margin kept free on every side of the usable area. */
  marginMm: number
  /** Gap between copies on the sheet, added to the kerf. */
  partGapMm: number
  bedWidthMm: number
  bedHeightMm: number
  /** Pixels per inch for px and unitless sizes (CSS: 96). */
  dpi: number
  setupTimeS: number
  pricePerMinuteMinor: number
  currency: string
  billingIncrementMinutes: number
  /** Material charged on the part's bounding-box area. */
  materialPriceMinorPerM2: number
  colourMapping: ColourRule[]
  /** DXF only: operation by layer name, checked before the colour mapping (absent: colours decide). */
  dxfLayerMapping?: DxfLayerRule[]
  /** What strokes of a colour the mapping does not know become (they are also reported). */
  unmappedStrokeOperation: Operation
  /** Largest distance between a curve and its flattened chords. */
  chordToleranceMm: number
  /** Ends of separate elements closer than this are joined into one contour. */
  chainToleranceMm: number
}

const DEFAULT_THICKNESS_MM = 3

/**
 * Minimum bridge and hole when the process setting gives none. Common
 * practice, no source: bridges narrower than about half the material
 * thickness and holes smaller than about the thickness cut poorly or not at all.
 */
export function limitsForThickness(thicknessMm: number): Pick<AnalysisParams, 'minBridgeMm' | 'minHoleMm'> {
  return { minBridgeMm: thicknessMm / 2, minHoleMm: thicknessMm }
}

/**
 * The default profile: an invented mid-size laser cutting 3 mm sheet. The
 * numbers are placeholders for a demo, not machine or safety recommendations —
 * real values come from the workshop's staff, the machine maker's manual and
 * the safety officer.
 */
export const DEFAULT_ANALYSIS_PARAMS: Readonly<AnalysisParams> = Object.freeze({
  cutSpeedMmPerMin: 1200,
  scoreSpeedMmPerMin: 6000,
  accelMmPerS2: 2000,
  rapidSpeedMmPerMin: 15000,
  junctionDeviationMm: 0.05,
  pierceTimeS: 0.4,
  engraveSpeedMmPerMin: 24000,
  engraveLineSpacingMm: 0.1,
  kerfMm: 0.15,
  thicknessMm: DEFAULT_THICKNESS_MM,
  ...limitsForThickness(DEFAULT_THICKNESS_MM),
  sheetWidthMm: 600,
  sheetHeightMm: 400,
  marginMm: 5,
  partGapMm: 2,
  bedWidthMm: 1000,
  bedHeightMm: 700,
  dpi: 96,
  setupTimeS: 120,
  pricePerMinuteMinor: 80,
  currency: 'EUR',
  billingIncrementMinutes: 1,
  materialPriceMinorPerM2: 2500,
  colourMapping: Object.freeze([
    { hex: '#c2185b', toleranceRgbDistance: 60, operation: 'cut' },
    { hex: '#00897b', toleranceRgbDistance: 60, operation: 'score' },
    { hex: '#f9a825', toleranceRgbDistance: 60, operation: 'engrave' },
    { hex: '#9e9e9e', toleranceRgbDistance: 30, operation: 'ignore' },
  ]) as ColourRule[],
  unmappedStrokeOperation: 'cut',
  chordToleranceMm: 0.01,
  chainToleranceMm: 0.01,
})

/** The default profile with the given fields replaced; minimum bridge and hole follow a given thickness unless given too. */
export function withDefaults(overrides: Partial<AnalysisParams> = {}): AnalysisParams {
  return { ...DEFAULT_ANALYSIS_PARAMS, ...limitsForThickness(overrides.thicknessMm ?? DEFAULT_THICKNESS_MM), ...overrides }
}
