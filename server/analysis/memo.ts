import type { AnalysedGeometry } from './index'
import type { AnalysisParams } from './params'
import type { PolylineSet } from './polylines'

/** The chained contours and their boxes, the input of every computation shared between stages. */
export type ContourGeometry = Pick<AnalysedGeometry, 'contours' | 'bounds'>

/**
 * Wraps a computation several stages or checks share so it runs once per
 * geometry and set of relevant params (`signatureOf`); the cache holds the
 * geometry weakly.
 */
export function oncePerGeometry<Params extends AnalysisParams | undefined, T>(
  signatureOf: (params: Params) => string,
  compute: (geometry: ContourGeometry, params: Params) => T,
): (geometry: ContourGeometry, params: Params) => T {
  const cache = new WeakMap<PolylineSet, { signature: string; value: T }>()
  return (geometry, params) => {
    const signature = signatureOf(params)
    const cached = cache.get(geometry.contours)
    if (cached !== undefined && cached.signature === signature) return cached.value
    const value = compute(geometry, params)
    cache.set(geometry.contours, { signature, value })
    return value
  }
}
