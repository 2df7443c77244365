import { findContainers, nestingDepths } from './containment'
import type { DrawnElement } from './readSvg'
import { OPERATION_CODES, type PolylineSet } from './polylines'

export interface Measurement {
  bbox: { x: number; y: number; width: number; height: number }
  cut: { lengthMm: number; pierces: number; closedContours: number; openContours: number }
  score: { lengthMm: number }
  engrave: { areaMm2: number }
}

/** Lengths, contour counts, pierces (one per cut contour), engrave area and bounding box of the chained contours. */
export function measureContours(contours: PolylineSet, bounds: Float64Array, elements: DrawnElement[]): Measurement {
  let cutLengthMm = 0
  let scoreLengthMm = 0
  let closedCutContours = 0
  let openCutContours = 0
  let minX = Infinity
  let minY = Infinity
  let maxX = -Infinity
  let maxY = -Infinity
  for (let index = 0; index < contours.count; index++) {
    minX = Math.min(minX, bounds[4 * index]!)
    minY = Math.min(minY, bounds[4 * index + 1]!)
    maxX = Math.max(maxX, bounds[4 * index + 2]!)
    maxY = Math.max(maxY, bounds[4 * index + 3]!)
    if (contours.operation[index] === OPERATION_CODES.cut) {
      cutLengthMm += contours.lengthMm[index]!
      if (contours.closed[index]) closedCutContours++
      else openCutContours++
    } else if (contours.operation[index] === OPERATION_CODES.score) {
      scoreLengthMm += contours.lengthMm[index]!
    }
  }
  return {
    bbox: { x: minX, y: minY, width: maxX - minX, height: maxY - minY },
    cut: { lengthMm: cutLengthMm, pierces: closedCutContours + openCutContours, closedContours: closedCutContours, openContours: openCutContours },
    score: { lengthMm: scoreLengthMm },
    engrave: { areaMm2: engraveArea(contours, bounds, elements) },
  }
}

/** Filled area of all engrave elements, each by its own fill rule; overlaps between elements count twice. */
function engraveArea(contours: PolylineSet, bounds: Float64Array, elements: DrawnElement[]): number {
  let areaMm2 = 0
  let first = 0
  // Engrave polylines are copied in drawing order, so each element's subpaths are consecutive.
  while (first < contours.count) {
    if (contours.operation[first] !== OPERATION_CODES.engrave) {
      first++
      continue
    }
    let end = first + 1
    while (end < contours.count && contours.operation[end] === OPERATION_CODES.engrave && contours.element[end] === contours.element[first]) end++
    areaMm2 += filledArea(contours, bounds, first, end, elements[contours.element[first]!]!.fillRule)
    first = end
  }
  return areaMm2
}

/**
 * Area of one filled element from its subpaths [first, end): each subpath's
 * ring (its shoelace area less its direct children's) is filled when the
 * fill rule says so — even depth for evenodd, non-zero summed orientation for
 * nonzero (SVG 1.1 §11.3).
 */
function filledArea(contours: PolylineSet, bounds: Float64Array, first: number, end: number, fillRule: 'nonzero' | 'evenodd'): number {
  if (end - first === 1) return Math.abs(contours.signedArea(first))
  const ids = Array.from({ length: end - first }, (_, offset) => first + offset)
  const parentOf = findContainers(contours, bounds, ids, ids)
  const depth = nestingDepths(parentOf, ids)
  const byDepth = [...ids].sort((a, b) => depth[a]! - depth[b]!)
  const winding = new Map<number, number>()
  let areaMm2 = 0
  for (const id of byDepth) {
    const signed = contours.signedArea(id)
    const parent = parentOf[id]!
    const ownWinding = (parent >= 0 ? winding.get(parent)! : 0) + Math.sign(signed)
    winding.set(id, ownWinding)
    const filled = fillRule === 'evenodd' ? depth[id]! % 2 === 0 : ownWinding !== 0
    const parentFilled = parent >= 0 && (fillRule === 'evenodd' ? depth[parent]! % 2 === 0 : winding.get(parent) !== 0)
    // A ring's area is its own less its children's: add it where filled, take it from a filled parent.
    if (filled) areaMm2 += Math.abs(signed)
    if (parentFilled) areaMm2 -= Math.abs(signed)
  }
  return areaMm2
}
