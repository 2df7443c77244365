import { analyzeSvgWithGeometry, type AnalysisParams, withDefaults } from '../../../server/analysis/index'
import { cutPath, mmDocument } from '../helpers'
import { type SiteRecord, sitesOf } from '../sites'

/** Kerf and limits for the hand-worked cases: 0.2 mm kerf, 1 mm minimum bridge. */
export const HAND_PARAMS: Partial<AnalysisParams> = { kerfMm: 0.2, minBridgeMm: 1 }

/** Sites of one code for a drawing of cut paths in a 1 mm user-unit document. */
export function findingsOf(code: string, paths: string[], overrides: Partial<AnalysisParams> = HAND_PARAMS): SiteRecord[] {
  return sitesOf(analyse(paths, overrides).result, code)
}

export function analyse(paths: string[], overrides: Partial<AnalysisParams> = HAND_PARAMS) {
  return analyzeSvgWithGeometry(mmDocument(paths.map((d) => cutPath(d)).join('')), withDefaults(overrides))
}

/** An SVG circle as path data (two half arcs), centre and radius in mm. */
export function circlePath(centreX: number, centreY: number, radiusMm: number): string {
  return `M${centreX - radiusMm} ${centreY}a${radiusMm} ${radiusMm} 0 1 0 ${2 * radiusMm} 0a${radiusMm} ${radiusMm} 0 1 0 ${-2 * radiusMm} 0z`
}

export function rectanglePath(x: number, y: number, widthMm: number, heightMm: number): string {
  return `M${x} ${y}h${widthMm}v${heightMm}h${-widthMm}z`
}

/** The sheet outline the hand-worked cases sit in, so closed cuts inside it are holes. */
export const SHEET_OUTLINE = rectanglePath(0, 0, 200, 200)
