import type { FindingCollector } from '../findings'
import type { AnalysisParams } from '../params'
import { cutTimeS } from './cutTime'
import type { CheckGeometry } from './index'
import { repeatToleranceMm } from './pairScan'
import { repeatedCutsOf } from './repeatedCuts'

/** Lines drawn more than once (within the repeat tolerance): one site per pair of contours, with the length cut twice; the group has the total and the time it adds at cut speed. */
export function checkDuplicateCuts(geometry: CheckGeometry, params: AnalysisParams, findings: FindingCollector): void {
  const sites = [...repeatedCutsOf(geometry, params).sites.values()]
  if (sites.length === 0) return
  const lengthMm = sites.reduce((sum, site) => sum + site.lengthMm, 0)
  const facts = { toleranceMm: repeatToleranceMm(params), lengthMm, seconds: cutTimeS(lengthMm, params) }
  const repeats = findings.group({ code: 'duplicate-cut', severity: 'warning', facts, worstFirst: 'largest' })
  for (const site of sites) repeats.add(site.x, site.y, site.lengthMm, site.contours[0], site.contours[1] ?? -1)
}
