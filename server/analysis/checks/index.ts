import type { FindingCollector } from '../findings'
import type { ContourGeometry } from '../memo'
import type { AnalysisParams } from '../params'
import type { DesignRuleSummary } from '../result'
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

export type { DesignRuleSummary } from '../result'

export type CheckGeometry = ContourGeometry
/** A check adds its sites to the groups of the collector (one group per code, severity, cause and limit). */
export type DesignRuleCheck = (geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector) => void

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

/** Runs every design-rule check on the chained geometry, adding to the analysis's findings, and sums up. */
export function runDesignRuleChecks(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): DesignRuleSummary {
  for (const check of CHECKS) check(geometry, params, findings)
  return summarise(findings, params)
}

function summarise(findings: FindingCollector, params: AnalysisParams): DesignRuleSummary {
  let narrowestBridgeMm: number | null = null
  for (const list of findings.listsOf('narrow-bridge')) {
    for (let site = 0; site < list.count; site++) {
      narrowestBridgeMm = narrowestBridgeMm === null ? list.value[site]! : Math.min(narrowestBridgeMm, list.value[site]!)
    }
  }
  let duplicateCutLengthMm = 0
  for (const list of findings.listsOf('duplicate-cut')) for (let site = 0; site < list.count; site++) duplicateCutLengthMm += list.value[site]!
  return {
    narrowBridgeSites: findings.countOf('narrow-bridge'),
    narrowestBridgeMm,
    duplicateCutLengthMm,
    duplicateCutTimeS: cutTimeS(duplicateCutLengthMm, params),
  }
}
