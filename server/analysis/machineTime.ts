import { cutNesting } from './containment'
import { PolylinePlanner, restToRestTimeS } from './motion'
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
  const scoreIds: number[] = []
  const cutIds: number[] = []
  for (let index = 0; index < contours.count; index++) {
    if (contours.operation[index] === OPERATION_CODES.score) scoreIds.push(index)
    if (contours.operation[index] === OPERATION_CODES.cut) cutIds.push(index)
  }
  const { depth } = cutNesting(contours, bounds)
  const levels: number[][] = [scoreIds]
  for (const id of cutIds) (levels[depth[id] + 1] ??= []).push(id)
  const runOrder = new Int32Array(scoreIds.length + cutIds.length)
  const cutLevelsDeepestFirst = levels.slice(1).reverse()

  const rapidSpeed = params.rapidSpeedMmPerMin / 60
  let travelMm = 0
  let travelS = 0
  let x = 0
  let y = 0
  let written = 0
  for (const level of [scoreIds, ...cutLevelsDeepestFirst]) {
    if (!level?.length) continue
    const stops = stopsOf(contours, level)
    const order = planTour(stops, level.length, x, y)
    const travel = tourTravel(stops, order, x, y, (moveMm) => {
      travelS += restToRestTimeS(moveMm, rapidSpeed, params.accelMmPerS2)
    })
    travelMm += travel.travelMm
    x = travel.endX
    y = travel.endY
    for (const entry of order) runOrder[written++] = entry >= 0 ? level[entry] : -1 - level[-1 - entry]
  }

  const planner = new PolylinePlanner()
  const runTimeS = (ids: number[], speedMmPerMin: number) =>
    ids.reduce((sum, id) => sum + planner.timeS(contours.xy, contours.start[id], contours.start[id + 1], speedMmPerMin / 60, params.accelMmPerS2, params.junctionDeviationMm), 0)
  const cutS = runTimeS(cutIds, params.cutSpeedMmPerMin)
  const scoreS = runTimeS(scoreIds, params.scoreSpeedMmPerMin)
  // Raster engraving sweeps the area line by line (common practice, no source); turnarounds are not modelled.
  const engraveS = engraveAreaMm2 > 0 ? engraveAreaMm2 / ((params.engraveSpeedMmPerMin / 60) * params.engraveLineSpacingMm) : 0
  const pierceS = cutIds.length * params.pierceTimeS
  const setupS = params.setupTimeS
  return {
    travelMm,
    time: { cutS, scoreS, engraveS, pierceS, travelS, setupS, totalS: cutS + scoreS + engraveS + pierceS + travelS + setupS },
    runOrder,
  }
}

function stopsOf(contours: PolylineSet, ids: number[]): TourStops {
  const stops: TourStops = {
    entryX: new Float64Array(ids.length),
    entryY: new Float64Array(ids.length),
    exitX: new Float64Array(ids.length),
    exitY: new Float64Array(ids.length),
  }
  ids.forEach((id, slot) => {
    const first = contours.start[id]
    const last = contours.start[id + 1] - 1
    stops.entryX[slot] = contours.xy[2 * first]
    stops.entryY[slot] = contours.xy[2 * first + 1]
    stops.exitX[slot] = contours.xy[2 * last]
    stops.exitY[slot] = contours.xy[2 * last + 1]
  })
  return stops
}
