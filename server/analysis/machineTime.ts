import { cutNesting } from './containment'
import { PolylineTimer, restToRestTimeS } from './motion'
import type { AnalysisParams } from './params'
import { OPERATION_CODES, type PolylineSet } from './polylines'
import { planTour, type TourStops, tourTravel } from './tour'

export interface MachineTime {
  travelMm: number
  time: { cutS: number; scoreS: number; engraveS: number; pierceS: number; travelS: number; setupS: number; totalS: number }
  /** Contour ids in the order the head runs them (negative −1−i: contour i backwards). */
  runOrder: Int32Array
}

/**
 * The cutter's job as it would run: score lines first, then cut contours from
 * the deepest nesting level out (a part's holes before its outline, so it
 * doesn't shift once free), each level toured from where the head is,
 * starting at the drawing origin. Every contour and every rapid move runs
 * through the constant-acceleration motion model.
 */
export function estimateMachineTime(contours: PolylineSet, bounds: Float64Array, engraveAreaMm2: number, params: AnalysisParams): MachineTime {
  const { ids, levelStart } = tourLevels(contours, cutNesting({ contours, bounds }).depth)
  const rapidSpeed = params.rapidSpeedMmPerMin / 60
  const runOrder = new Int32Array(ids.length)
  let travelMm = 0
  let travelS = 0
  let x = 0
  let y = 0
  let written = 0
  const levelCount = levelStart.length - 1
  for (let step = 0; step < levelCount; step++) {
    // Level 0 (the score lines) first, then the cut levels from the deepest out.
    const level = step === 0 ? 0 : levelCount - step
    const levelIds = ids.subarray(levelStart[level], levelStart[level + 1])
    if (levelIds.length === 0) continue
    const stops = stopsOf(contours, levelIds)
    const order = planTour(stops, levelIds.length, x, y)
    const travel = tourTravel(stops, order, x, y)
    travelMm += travel.travelMm
    for (const moveMm of travel.moveMm) travelS += restToRestTimeS(moveMm, rapidSpeed, params.accelMmPerS2)
    x = travel.endX
    y = travel.endY
    for (const entry of order) runOrder[written++] = entry >= 0 ? levelIds[entry]! : -1 - levelIds[-1 - entry]!
  }

  const timer = new PolylineTimer()
  const runTimeS = (id: number, speedMmPerMin: number) =>
    timer.timeS(contours.xy, contours.start[id]!, contours.start[id + 1]!, speedMmPerMin / 60, params.accelMmPerS2, params.junctionDeviationMm)
  let cutS = 0
  let scoreS = 0
  let cutCount = 0
  for (let id = 0; id < contours.count; id++) {
    const operation = contours.operation[id]
    if (operation === OPERATION_CODES.cut) {
      cutS += runTimeS(id, params.cutSpeedMmPerMin)
      cutCount++
    }
    if (operation === OPERATION_CODES.score) scoreS += runTimeS(id, params.scoreSpeedMmPerMin)
  }
  // Raster engraving sweeps the area line by line (common practice, no source); turnarounds are not modelled.
  const engraveS = engraveAreaMm2 > 0 ? engraveAreaMm2 / ((params.engraveSpeedMmPerMin / 60) * params.engraveLineSpacingMm) : 0
  // One pierce per cut contour.
  const pierceS = cutCount * params.pierceTimeS
  const setupS = params.setupTimeS
  return {
    travelMm,
    time: { cutS, scoreS, engraveS, pierceS, travelS, setupS, totalS: cutS + scoreS + engraveS + pierceS + travelS + setupS },
    runOrder,
  }
}

interface TourLevels {
  ids: Int32Array
  levelStart: Int32Array
}

/**
 * The toured contours grouped by level, ascending ids within each: level 0
 * holds the score lines, level d + 1 the cuts at nesting depth d. Level l is
 * ids[levelStart[l] … levelStart[l + 1]).
 */
function tourLevels(contours: PolylineSet, cutDepth: Int32Array): TourLevels {
  const levelOf = new Int32Array(contours.count).fill(-1)
  let levelCount = 1
  for (let id = 0; id < contours.count; id++) {
    if (contours.operation[id] === OPERATION_CODES.score) levelOf[id] = 0
    if (contours.operation[id] === OPERATION_CODES.cut) levelOf[id] = cutDepth[id]! + 1
    levelCount = Math.max(levelCount, levelOf[id]! + 1)
  }
  const levelStart = new Int32Array(levelCount + 1)
  for (let id = 0; id < contours.count; id++) if (levelOf[id]! >= 0) levelStart[levelOf[id]! + 1]!++
  for (let level = 0; level < levelCount; level++) levelStart[level + 1]! += levelStart[level]!
  const ids = new Int32Array(levelStart[levelCount]!)
  const filled = levelStart.slice(0, levelCount)
  for (let id = 0; id < contours.count; id++) if (levelOf[id]! >= 0) ids[filled[levelOf[id]!]!++] = id
  return { ids, levelStart }
}

function stopsOf(contours: PolylineSet, ids: Int32Array): TourStops {
  const stops: TourStops = {
    entryX: new Float64Array(ids.length),
    entryY: new Float64Array(ids.length),
    exitX: new Float64Array(ids.length),
    exitY: new Float64Array(ids.length),
  }
  for (let slot = 0; slot < ids.length; slot++) {
    const first = contours.start[ids[slot]!]!
    const last = contours.start[ids[slot]! + 1]! - 1
    stops.entryX[slot] = contours.xy[2 * first]!
    stops.entryY[slot] = contours.xy[2 * first + 1]!
    stops.exitX[slot] = contours.xy[2 * last]!
    stops.exitY[slot] = contours.xy[2 * last + 1]!
  }
  return stops
}
