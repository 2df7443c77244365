import type { IArcEntity, ICircleEntity, IEllipseEntity, IEntity, ILineEntity, ILwpolylineEntity, IPolylineEntity } from 'dxf-parser'
import { PathDataWriter, type Point2 } from './pathData'
import type { RawGroupEntity } from './rawGroupEntities'
import { drawFitPointSpline, drawSpline, type FitPointSpline, type SplineDefinition, splineProblem } from './spline'

const FULL_TURN_RAD = 2 * Math.PI

/** Why an entity of a type the reader draws has no path: a LINE without both ends, a 3D mesh, a SPLINE whose numbers describe no curve (`detail` says which). */
export type EntityProblem = { problem: 'line-without-ends' | '3d-mesh' | 'bad-spline'; detail?: string }

/** What one drawing entity becomes: path data in its own coordinates, or why it has none. */
export type EntityPath = { pathData: string } | EntityProblem | undefined

/**
 * Path data for the entity types that draw lines, in the entity's
 * coordinates (drawing units, Y up); undefined for other types.
 * `toleranceUnits` is the chord tolerance in those units, for splines;
 * `mirrorX` writes x as −x (see PathDataWriter).
 */
export function entityPathData(entity: IEntity, toleranceUnits: number, mirrorX: boolean): EntityPath {
  const path = new PathDataWriter(mirrorX)
  switch (entity.type) {
    case 'LINE': {
      const [start, end] = (entity as ILineEntity).vertices
      if (!start || !end) return { problem: 'line-without-ends' }
      path.moveTo(start.x, start.y)
      path.lineTo(end.x, end.y)
      break
    }
    case 'LWPOLYLINE': {
      const polyline = entity as ILwpolylineEntity
      drawVertices(polyline.vertices ?? [], polyline.shape, path)
      break
    }
    case 'POLYLINE': {
      const polyline = entity as IPolylineEntity
      if (polyline.is3dPolygonMesh || polyline.isPolyfaceMesh) return { problem: '3d-mesh' }
      // A spline-fit polyline lists its frame's control points too; the curve is the fitted vertices.
      drawVertices(polyline.vertices.filter((vertex) => !vertex.splineControlPoint), polyline.shape, path)
      break
    }
    case 'CIRCLE': {
      const circle = entity as ICircleEntity
      path.ellipticalArc(circle.center, { x: circle.radius, y: 0 }, 1, 0, FULL_TURN_RAD, false)
      path.close()
      break
    }
    case 'ARC': {
      const arc = entity as IArcEntity
      path.ellipticalArc(arc.center, { x: arc.radius, y: 0 }, 1, arc.startAngle, counterClockwiseSweep(arc.startAngle, arc.endAngle), false)
      break
    }
    case 'ELLIPSE': {
      const ellipse = entity as IEllipseEntity
      const startRad = ellipse.startAngle ?? 0
      const sweepRad = counterClockwiseSweep(startRad, ellipse.endAngle ?? FULL_TURN_RAD)
      path.ellipticalArc(ellipse.center, ellipse.majorAxisEndPoint, ellipse.axisRatio, startRad, sweepRad, false)
      if (sweepRad >= FULL_TURN_RAD) path.close()
      break
    }
    case 'SPLINE':
      return splinePath(entity as RawGroupEntity, toleranceUnits, path)
    default:
      return undefined
  }
  return path.isEmpty ? undefined : { pathData: path.toString() }
}

/** DXF arcs run counter-clockwise from start to end; equal angles (after whole turns) mean a full turn. */
function counterClockwiseSweep(startRad: number, endRad: number): number {
  const sweep = (((endRad - startRad) % FULL_TURN_RAD) + FULL_TURN_RAD) % FULL_TURN_RAD
  return sweep === 0 ? FULL_TURN_RAD : sweep
}

/** A polyline's vertices; each vertex's bulge shapes the segment to the next one (the last one's, the closing segment). */
function drawVertices(vertices: ReadonlyArray<Point2 & { bulge?: number }>, closed: boolean, path: PathDataWriter): void {
  if (vertices.length === 0) return
  path.moveTo(vertices[0]!.x, vertices[0]!.y)
  for (let index = 1; index < vertices.length; index++) path.bulgeTo(vertices[index]!, vertices[index - 1]!.bulge ?? 0)
  if (!closed) return
  path.bulgeTo(vertices[0]!, vertices[vertices.length - 1]!.bulge ?? 0)
  path.close()
}

/**
 * SPLINE groups (DXF reference, SPLINE): 70 flags (1 closed, 2 periodic),
 * 71 degree, 40 knots, 41 weights, 10/20 control points, 11/21 fit points,
 * 12/22 and 13/23 start and end tangents. A spline given only by fit points
 * is the cubic through them (`drawFitPointSpline`).
 */
function splinePath(entity: RawGroupEntity, toleranceUnits: number, path: PathDataWriter): EntityPath {
  const spline: SplineDefinition = { degree: 3, knots: [], controlPoints: [], weights: [] }
  const fit: FitPointSpline = { fitPoints: [], closed: false }
  for (const [code, value] of entity.groups) {
    const number = value as number
    if (code === 70) fit.closed = (number & 1) === 1
    else if (code === 71) spline.degree = number
    else if (code === 40) spline.knots.push(number)
    else if (code === 41) spline.weights.push(number)
    else if (code === 10) spline.controlPoints.push({ x: number, y: 0 })
    else if (code === 20 && spline.controlPoints.length > 0) spline.controlPoints[spline.controlPoints.length - 1]!.y = number
    else if (code === 11) fit.fitPoints.push({ x: number, y: 0 })
    else if (code === 21 && fit.fitPoints.length > 0) fit.fitPoints[fit.fitPoints.length - 1]!.y = number
    else if (code === 12) fit.startTangent = { x: number, y: 0 }
    else if (code === 22 && fit.startTangent) fit.startTangent.y = number
    else if (code === 13) fit.endTangent = { x: number, y: 0 }
    else if (code === 23 && fit.endTangent) fit.endTangent.y = number
  }
  if (spline.controlPoints.length === 0 && fit.fitPoints.length >= 2) {
    drawFitPointSpline(fit, path)
    return { pathData: path.toString() }
  }
  const problem = splineProblem(spline)
  if (problem) return { problem: 'bad-spline', detail: problem }
  drawSpline(spline, toleranceUnits, path)
  return { pathData: path.toString() }
}
