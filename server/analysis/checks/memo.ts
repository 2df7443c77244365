import type { AnalysisParams } from '../params'
import type { PolylineSet } from '../polylines'
import type { CheckGeometry } from './index'

/**
 * Wraps a computation several checks share so it runs once per geometry and
 * set of relevant params (`signatureOf`); the cache holds the geometry weakly.
 */
export function oncePerGeometry<Params extends AnalysisParams | void, T>(signatureOf: (params: Params) => string, compute: (geometry: CheckGeometry, params: Params) => T): (geometry: CheckGeometry, params: Params) => T {
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
