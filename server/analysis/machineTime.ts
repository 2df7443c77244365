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
  const { runOrder, travelMm, travelS } = tourLevelsInRunOrder(contours, tourLevels(contours, cutNesting({ contours, bounds }).depth), params)
  const { cutS, scoreS, cutCount } = contourRunTimes(contours, params)
  // Raster engraving sweeps the area line by line (common practice, no source); turnarounds are not modelled.
  const engraveS = engraveAreaMm2 > 0 ? engraveAreaMm2 / ((params.engraveSpeedMmPerMin / 60) * params.engraveLineSpacingMm) : 0
  const pierceS = cutCount * params.pierceTimeS
  const setupS = params.setupTimeS
  return {
    travelMm,
    time: { cutS, scoreS, engraveS, pierceS, travelS, setupS, totalS: cutS + scoreS + engraveS + pierceS + travelS + setupS },
    runOrder,
  }
}

// Each long loop below has a function of its own: a function that runs once per analysis gets optimized inside its hot loop, and code after that loop would then run unoptimized.

/** Tours level 0 (the score lines) first, then the cut levels from the deepest out, each from where the one before left the head. */
function tourLevelsInRunOrder(contours: PolylineSet, { ids, levelStart }: TourLevels, params: AnalysisParams): { runOrder: Int32Array; travelMm: number; travelS: number } {
  const runOrder = new Int32Array(ids.length)
  const rapidSpeed = params.rapidSpeedMmPerMin / 60
  let travelMm = 0
  let travelS = 0
  let x = 0
  let y = 0
  let written = 0
  const levelCount = levelStart.length - 1
  for (let step = 0; step < levelCount; step++) {
    const level = step === 0 ? 0 : levelCount - step
    const levelIds = ids.subarray(levelStart[level], levelStart[level + 1])
    if (levelIds.length === 0) continue
    const stops = stopsOf(contours, levelIds)
    const order = planTour(stops, levelIds.length, x, y)
    const travel = tourTravel(stops, order, x, y)
    travelMm += travel.travelMm
    travelS = addRapidTimes(travelS, travel.moveMm, rapidSpeed, params.accelMmPerS2)
    x = travel.endX
    y = travel.endY
    written = appendRunOrder(runOrder, written, order, levelIds)
  }
  return { runOrder, travelMm, travelS }
}

/** `totalS` plus the rest-to-rest time of each rapid move, added one at a time in tour order. */
function addRapidTimes(totalS: number, moveMm: Float64Array, rapidSpeed: number, accel: number): number {
  let sumS = totalS
  for (let move = 0; move < moveMm.length; move++) sumS += restToRestTimeS(moveMm[move], rapidSpeed, accel)
  return sumS
}

/** Writes a level's tour into the run order as contour ids from `written` on; returns where it stopped. */
function appendRunOrder(runOrder: Int32Array, written: number, order: Int32Array, levelIds: Int32Array): number {
  let next = written
  for (let position = 0; position < order.length; position++) {
    const entry = order[position]
    runOrder[next++] = entry >= 0 ? levelIds[entry] : -1 - levelIds[-1 - entry]
  }
  return next
}

/** Cut and score time of each contour at its operation's speed, summed in id order, and the number of cuts (one pierce each). */
function contourRunTimes(contours: PolylineSet, params: AnalysisParams): { cutS: number; scoreS: number; cutCount: number } {
  const timer = new PolylineTimer()
  let cutS = 0
  let scoreS = 0
  let cutCount = 0
  for (let id = 0; id < contours.count; id++) {
    const operation = contours.operation[id]
    if (operation === OPERATION_CODES.cut) {
      cutS += runTimeS(timer, contours, id, params.cutSpeedMmPerMin, params)
      cutCount++
    }
    if (operation === OPERATION_CODES.score) scoreS += runTimeS(timer, contours, id, params.scoreSpeedMmPerMin, params)
  }
  return { cutS, scoreS, cutCount }
}

function runTimeS(timer: PolylineTimer, contours: PolylineSet, id: number, speedMmPerMin: number, params: AnalysisParams): number {
  return timer.timeS(contours.xy, contours.start[id], contours.start[id + 1], speedMmPerMin / 60, params.accelMmPerS2, params.junctionDeviationMm)
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
    if (contours.operation[id] === OPERATION_CODES.cut) levelOf[id] = cutDepth[id] + 1
    levelCount = Math.max(levelCount, levelOf[id] + 1)
  }
  const levelStart = new Int32Array(levelCount + 1)
  for (let id = 0; id < contours.count; id++) if (levelOf[id] >= 0) levelStart[levelOf[id] + 1]++
  for (let level = 0; level < levelCount; level++) levelStart[level + 1] += levelStart[level]
  const ids = new Int32Array(levelStart[levelCount])
  const filled = levelStart.slice(0, levelCount)
  for (let id = 0; id < contours.count; id++) if (levelOf[id] >= 0) ids[filled[levelOf[id]]++] = id
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
    const first = contours.start[ids[slot]]
    const last = contours.start[ids[slot] + 1] - 1
    stops.entryX[slot] = contours.xy[2 * first]
    stops.entryY[slot] = contours.xy[2 * first + 1]
    stops.exitX[slot] = contours.xy[2 * last]
    stops.exitY[slot] = contours.xy[2 * last + 1]
  }
  return stops
}
