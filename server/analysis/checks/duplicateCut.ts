import type { AnalysisParams } from '../params'
import type { Finding } from '../result'
import { formatMm } from './format'
import { cutTimeS } from './cutTime'
import type { CheckGeometry } from './index'
import { repeatToleranceMm } from './pairScan'
import { repeatedCutsOf } from './repeatedCuts'

/** Lines drawn more than once (within the repeat tolerance): one finding per pair of contours, with the length cut twice and the time it adds at cut speed. */
export function checkDuplicateCuts(geometry: CheckGeometry, params: AnalysisParams): Finding[] {
  return [...repeatedCutsOf(geometry, params).sites.values()].map((site) => ({
    code: 'duplicate-cut',
    severity: 'warning',
    message: `${formatMm(site.lengthMm)} of line is drawn twice (within ${formatMm(repeatToleranceMm(params))}), so the machine cuts it twice: burn marks and about ${cutTimeS(site.lengthMm, params).toFixed(1)} s more cutting. Delete the copy.`,
    x: site.x,
    y: site.y,
    valueMm: site.lengthMm,
    contours: site.contours,
  }))
}
