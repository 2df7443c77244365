import { svgPathProperties } from 'svg-path-properties'

// Drawings repeat the same holes, reliefs and rounded corners thousands of
// times; past this many distinct curves the memory starts afresh.
const MAX_REMEMBERED_CURVES = 50_000
// A curve is measured moved to the origin with its numbers rounded to a
// nanometre, so its length depends only on its shape and copies of a shape
// share one measurement wherever they are (the rounding changes a length by
// far less than any cutter resolves, and the result never depends on what
// was measured before).
const ROUNDINGS_PER_MM = 1e9
// Past this a number is no cut-file curve (such coordinates are refused later); measure it as it is.
const MAX_ROUNDED_MM = 1e6

const rememberedLengthsMm = new Map<string, number>()

/** svg-path-properties' length of one absolute C, Q or A segment (as svgpath writes it) starting at (fromX, fromY). */
export function measuredCurveLength(fromX: number, fromY: number, segment: [string, ...number[]]): number {
  const key = shapeKey(fromX, fromY, segment)
  if (key === undefined) return lengthAsDrawn(fromX, fromY, segment)
  let lengthMm = rememberedLengthsMm.get(key)
  if (lengthMm === undefined) {
    lengthMm = new svgPathProperties(pathDataFromOrigin(segment[0], key)).getTotalLength()
    // svg-path-properties' arc solver answers NaN for some arcs whose radii just fit (a square root of a rounding error
    // below zero); which ones depends on the last bits, so the arc as drawn may still measure.
    if (Number.isNaN(lengthMm)) return lengthAsDrawn(fromX, fromY, segment)
    if (rememberedLengthsMm.size >= MAX_REMEMBERED_CURVES) rememberedLengthsMm.clear()
    rememberedLengthsMm.set(key, lengthMm)
  }
  return lengthMm
}

function lengthAsDrawn(fromX: number, fromY: number, segment: [string, ...number[]]): number {
  return new svgPathProperties(`M${fromX} ${fromY}${segment.join(' ')}`).getTotalLength()
}

/**
 * The command and the segment's numbers from the origin in whole nanometres
 * (integers print much faster than fractions); undefined when a number is
 * too large to round.
 */
function shapeKey(fromX: number, fromY: number, segment: [string, ...number[]]): string | undefined {
  const isArc = segment[0] === 'A'
  let key = segment[0]
  for (let position = 1; position < segment.length; position++) {
    // Only an arc's end point is a position; its radii, rotation and flags stay as they are (flags round to themselves).
    const origin = isArc ? (position === 6 ? fromX : position === 7 ? fromY : 0) : position % 2 === 1 ? fromX : fromY
    const value = Number(segment[position]) - origin
    if (!(Math.abs(value) <= MAX_ROUNDED_MM)) return undefined
    key += ` ${Math.round(value * ROUNDINGS_PER_MM)}`
  }
  return key
}

function pathDataFromOrigin(command: string, key: string): string {
  const numbers = key.split(' ').slice(1).map((nanometres) => Number(nanometres) / ROUNDINGS_PER_MM)
  return `M0 0${command} ${numbers.join(' ')}`
}
