import type { ContourGeometry } from '../memo'
import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { cutTimeS } from './cutTime'
import { checkDuplicateCuts } from './duplicateCut'
import { checkMaterialAllowed } from './materialNotAllowed'
import { checkMergedCuts } from './mergedCuts'
import { checkNarrowBridges } from './narrowBridge'
import { checkOpenContours } from './openContour'
import { checkOutsideSheet } from './outsideSheet'
import { checkSelfIntersections } from './selfIntersection'
import { checkSmallHoles } from './smallHole'
import { checkTinySegments } from './tinySegment'
import { checkThickness } from './tooThick'

/** The design-rule checks' additions to the engine's result types (additive, optional fields). */
declare module '../result' {
  interface Finding {
    /** Contour ids (indexes into the engine's contours and the preview's `contours`) the finding concerns. */
    contours?: number[]
  }
  interface AnalysisResult {
    checks?: DesignRuleSummary
  }
}

export interface DesignRuleSummary {
  narrowBridgeSites: number
  /** Narrowest web left between cuts, when any bridge is below the minimum. */
  narrowestBridgeMm: number | null
  /** Length the machine would cut a second time. */
  duplicateCutLengthMm: number
  /** That length at cut speed. */
  duplicateCutTimeS: number
}

export type CheckGeometry = ContourGeometry
export type DesignRuleCheck = (geometry: CheckGeometry, params: AnalysisParams) => Finding[]

const CHECKS: DesignRuleCheck[] = [
  checkMaterialAllowed,
  checkThickness,
  checkOutsideSheet,
  checkNarrowBridges,
  checkMergedCuts,
  checkSelfIntersections,
  checkDuplicateCuts,
  checkSmallHoles,
  checkTinySegments,
  checkOpenContours,
]

/** Runs every design-rule check on the chained geometry. */
export function runDesignRuleChecks(geometry: CheckGeometry, params: AnalysisParams): { findings: Finding[]; summary: DesignRuleSummary } {
  const findings = CHECKS.flatMap((check) => check(geometry, params))
  return { findings, summary: summarise(findings, params) }
}

const SEVERITY_RANK = { error: 0, warning: 1, info: 2 } as const

/** Errors first, then warnings, then notes; the order within a severity is kept (narrow bridges stay narrowest first). */
export function sortBySeverity(findings: Finding[]): Finding[] {
  return [...findings].sort((a, b) => SEVERITY_RANK[a.severity] - SEVERITY_RANK[b.severity])
}

function summarise(findings: Finding[], params: AnalysisParams): DesignRuleSummary {
  const bridges = findings.filter((finding) => finding.code === 'narrow-bridge')
  const duplicateCutLengthMm = findings.filter((finding) => finding.code === 'duplicate-cut').reduce((sum, finding) => sum + (finding.valueMm ?? 0), 0)
  return {
    narrowBridgeSites: bridges.length,
    narrowestBridgeMm: bridges.reduce<number | null>((narrowest, finding) => (narrowest === null ? finding.valueMm! : Math.min(narrowest, finding.valueMm!)), null),
    duplicateCutLengthMm,
    duplicateCutTimeS: cutTimeS(duplicateCutLengthMm, params),
  }
}
