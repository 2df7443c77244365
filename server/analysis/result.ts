import type { FindingGroup, FindingSites } from '../../shared/finding-groups'

export type { FindingGroup, FindingSites, FindingStats, Severity } from '../../shared/finding-groups'

/** What the design-rule checks add up over their sites. */
export interface DesignRuleSummary {
  narrowBridgeSites: number
  /** Narrowest web left between cuts, when any bridge is below the minimum. */
  narrowestBridgeMm: number | null
  /** Length the machine would cut a second time. */
  duplicateCutLengthMm: number
  /** That length at cut speed. */
  duplicateCutTimeS: number
}

export interface AnalysisResult {
  bbox: { x: number; y: number; width: number; height: number }
  cut: { lengthMm: number; pierces: number; closedContours: number; openContours: number }
  score: { lengthMm: number }
  engrave: { areaMm2: number }
  travelMm: number
  time: { cutS: number; scoreS: number; engraveS: number; pierceS: number; travelS: number; setupS: number; totalS: number }
  sheet: { fits: boolean; rotated: boolean; copies: number; fitsBed: boolean }
  /** Errors, then warnings, then notes; messages come from shared/finding-messages.ts. */
  findingGroups: FindingGroup[]
  /** Every group's sites, group by group, worst first (contour ids index the analysed geometry's contours). */
  sites: FindingSites
  checks: DesignRuleSummary
}
