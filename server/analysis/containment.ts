import Flatbush from 'flatbush'
import { type ContourGeometry, oncePerGeometry } from './memo'
import { OPERATION_CODES, type PolylineSet } from './polylines'

/**
 * For each query polyline, the smallest closed polyline among `containers`
 * that contains it, indexed by polyline id (−1: none, or not a query). Container boxes go into a flatbush index, so a
 * query only tests the few containers whose box holds its own box; the exact
 * test is an even–odd ray cast from the middle of the query's first segment.
 */
export function findContainers(polylines: PolylineSet, bounds: Float64Array, containers: ArrayLike<number>, queries: ArrayLike<number>): Int32Array {
  const parent = new Int32Array(polylines.count).fill(-1)
  if (containers.length === 0 || queries.length === 0) return parent
  const index = new Flatbush(containers.length)
  const absoluteArea = new Float64Array(containers.length)
  for (let slot = 0; slot < containers.length; slot++) {
    const container = containers[slot]!
    index.add(bounds[4 * container]!, bounds[4 * container + 1]!, bounds[4 * container + 2]!, bounds[4 * container + 3]!)
    absoluteArea[slot] = Math.abs(polylines.signedArea(container))
  }
  index.finish()
  for (let queryIndex = 0; queryIndex < queries.length; queryIndex++) {
    const query = queries[queryIndex]!
    const minX = bounds[4 * query]!
    const minY = bounds[4 * query + 1]!
    const maxX = bounds[4 * query + 2]!
    const maxY = bounds[4 * query + 3]!
    const queryArea = polylines.closed[query] ? Math.abs(polylines.signedArea(query)) : 0
    const point = polylines.start[query]!
    const probeX = (polylines.xy[2 * point]! + polylines.xy[2 * point + 2]!) / 2
    const probeY = (polylines.xy[2 * point + 1]! + polylines.xy[2 * point + 3]!) / 2
    let bestArea = Infinity
    for (const slot of index.search(minX, minY, maxX, maxY)) {
      const container = containers[slot]!
      if (container === query || absoluteArea[slot]! >= bestArea) continue
      // A container must be strictly bigger, so two copies of one outline never contain each other.
      if (absoluteArea[slot]! <= queryArea) continue
      if (bounds[4 * container]! > minX || bounds[4 * container + 1]! > minY || bounds[4 * container + 2]! < maxX || bounds[4 * container + 3]! < maxY) continue
      if (!containsPoint(polylines, container, probeX, probeY)) continue
      parent[query] = container
      bestArea = absoluteArea[slot]!
    }
  }
  return parent
}

/** Even–odd ray casting towards +x over the polyline's segments. */
export function containsPoint(polylines: PolylineSet, polyline: number, x: number, y: number): boolean {
  const { xy } = polylines
  let inside = false
  for (let point = polylines.start[polyline]!; point < polylines.start[polyline + 1]! - 1; point++) {
    const ax = xy[2 * point]!
    const ay = xy[2 * point + 1]!
    const bx = xy[2 * point + 2]!
    const by = xy[2 * point + 3]!
    if (ay > y !== by > y && x < ax + ((y - ay) * (bx - ax)) / (by - ay)) inside = !inside
  }
  return inside
}

/** Nesting depth of each listed polyline (0 = top level), following `parentOf` as returned by findContainers. */
export function nestingDepths(parentOf: Int32Array, ids: ArrayLike<number>): Int32Array {
  const depth = new Int32Array(parentOf.length).fill(-1)
  const path: number[] = []
  for (let slot = 0; slot < ids.length; slot++) {
    let current = ids[slot]!
    while (current >= 0 && depth[current]! < 0) {
      path.push(current)
      current = parentOf[current]!
    }
    let base = current >= 0 ? depth[current]! : -1
    while (path.length > 0) depth[path.pop()!] = ++base
  }
  return depth
}

/** How the cut contours nest: closed cuts contain, every cut is a query. */
export interface CutNesting {
  /** Per contour: the smallest closed cut around it (−1: none, or not a cut). */
  parentOf: Int32Array
  /** Per cut contour: its nesting depth (0 = top level); −1 for other contours. */
  depth: Int32Array
}

/** The nesting of a contour set's cuts, found once (the design-rule checks and the time model both need it). */
const cutNestingOnce = oncePerGeometry<undefined, CutNesting>(() => '', ({ contours, bounds }) => {
  const cutIds: number[] = []
  const closedCutIds: number[] = []
  for (let id = 0; id < contours.count; id++) {
    if (contours.operation[id] !== OPERATION_CODES.cut) continue
    cutIds.push(id)
    if (contours.closed[id] === 1) closedCutIds.push(id)
  }
  const parentOf = findContainers(contours, bounds, closedCutIds, cutIds)
  return { parentOf, depth: nestingDepths(parentOf, cutIds) }
})
export const cutNesting = (geometry: ContourGeometry): CutNesting => cutNestingOnce(geometry, undefined)
