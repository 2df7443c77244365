import type { IDxf, IEllipseEntity, IEntity, IInsertEntity, IPoint, IPolylineEntity } from 'dxf-parser'
import { AnalysisInputError } from '../errors'
import type { FindingCollector, GroupSpec, SiteList } from '../findings'
import { applyX, applyY, IDENTITY, type Matrix, multiply, scaling, translation } from '../matrix'
import type { AnalysisParams } from '../params'
import { type DrawnElement, type ReadDrawing, strokeOperation } from '../readSvg'
import { entityPathData } from './entityPaths'
import { DxfLayers, effectiveLayer, entityColour } from './layers'
import { colourHex, DxfOperationMapper } from './operationMapping'
import type { RawGroupEntity } from './rawGroupEntities'
import { drawingUnits } from './units'

// As for SVG's <use>: bounds what nested INSERTs can multiply, and stops blocks that insert themselves.
// Measured here: a million entities is about 3 s, so a refused file fails within seconds, well inside the worker's timeout.
const MAX_INSERT_DEPTH = 32
const MAX_VISITED_ENTITIES = 1_000_000
// An extrusion direction this close to ±Z is the drawing plane (the arbitrary axis algorithm's own threshold is 1/64 on X and Y).
const PLANAR_EXTRUSION_Z = 1 - 1e-9

/** What DXF entities that draw no cut lines are reported as, like text and images in SVG. */
const NOT_CUT: Readonly<Record<string, string>> = {
  TEXT: 'text-not-outlined',
  MTEXT: 'text-not-outlined',
  DIMENSION: 'dxf-dimension',
  HATCH: 'dxf-hatch',
  IMAGE: 'raster-image',
}

interface Pending {
  entity: IEntity
  matrix: Matrix
  /** The inserting entity's layer and colour, for layer-0 and BYBLOCK entities of a block. */
  insertLayer?: string
  byBlockColour?: number
  /** Names of the blocks being inserted around this entity, innermost first. */
  blockChain: BlockChain | undefined
}

interface BlockChain {
  name: string
  depth: number
  outer: BlockChain | undefined
}

/**
 * Lists a DXF drawing's visible line-drawing entities as the SVG reader lists
 * shapes: path data in entity coordinates with a matrix into mm, and an
 * operation from the layer or colour mapping. The matrix scales by
 * $INSUNITS and mirrors Y (DXF's Y points up, the engine's — like SVG's —
 * down), so a DXF point (x, y) lands at (x, −y) mm: the picture the member
 * drew, not its mirror image, in the SVG frame. INSERTs are expanded with an
 * explicit stack (no recursion), at most MAX_INSERT_DEPTH deep. What is not
 * cut is reported as a group per kind with a site per entity; a layer and
 * colour the mappings lack as a group with a site at its first line.
 */
export function readDxfDocument(dxf: IDxf, params: AnalysisParams, findings: FindingCollector): ReadDrawing {
  const units = drawingUnits(dxf.header?.$INSUNITS)
  const layers = new DxfLayers(dxf.tables)
  const mapper = new DxfOperationMapper(params)
  const elements: DrawnElement[] = []
  if (units.assumed) findings.group({ code: 'dxf-units-assumed', severity: 'warning' }).add(0, 0)
  const reportedMappings = new Map<string, SiteList>()
  const stack: Pending[] = []
  const pushEntities = (entities: IEntity[] | undefined, matrix: Matrix, context: Omit<Pending, 'entity' | 'matrix'>) => {
    for (let index = (entities?.length ?? 0) - 1; index >= 0; index--) stack.push({ entity: entities![index]!, matrix, ...context })
  }
  pushEntities(dxf.entities, scaling(units.mmPerUnit, -units.mmPerUnit), { blockChain: undefined })
  let visited = 0

  while (stack.length > 0) {
    const { entity, matrix: parentMatrix, insertLayer, byBlockColour, blockChain } = stack.pop()!
    if (++visited > MAX_VISITED_ENTITIES) {
      throw new AnalysisInputError('tooComplex', 'This drawing repeats blocks too often to analyse (its INSERTs multiply into millions of entities).')
    }
    if (entity.visible === false || entity.inPaperSpace) continue
    const layerName = effectiveLayer(entity, insertLayer)
    const layer = layers.state(layerName)
    const colour = entityColour(entity, layer.colour, byBlockColour)
    const matrix = isTiltedInWorld(entity, params.chordToleranceMm / linearScale(parentMatrix)) ? undefined : withObjectCoordinates(parentMatrix, entity)
    // An ELLIPSE's points stay in world coordinates, whatever matrix draws it.
    const findingMatrix = matrix && entity.type !== 'ELLIPSE' ? matrix : parentMatrix
    const at = (point: IPoint | undefined): [number, number] => [
      applyX(findingMatrix, point?.x ?? 0, point?.y ?? 0),
      applyY(findingMatrix, point?.x ?? 0, point?.y ?? 0),
    ]
    if (!matrix) {
      if (!layer.frozen) reportNotCut({ code: 'dxf-not-planar' }, ...at(firstPointOf(entity)))
      continue
    }
    if (entity.type === 'INSERT') {
      // A frozen insert hides the whole block; an insert on a layer that is off hides only what inherits that layer.
      if (!layer.frozen) expandInsert(entity as IInsertEntity, matrix, layerName, colour, blockChain)
      continue
    }
    if (layer.frozen || layer.off) continue
    const notCutCode = NOT_CUT[entity.type]
    if (notCutCode) {
      reportNotCut({ code: notCutCode }, ...at(firstPointOf(entity)))
      continue
    }
    // A mirroring matrix (DXF's Y flip, a mirrored block or extrusion) is undone in the path data: see PathDataWriter.
    const mirrored = matrix[0] * matrix[3] - matrix[1] * matrix[2] < 0
    const drawn = entityPathData(entity.type === 'ELLIPSE' ? ellipseInObjectCoordinates(entity as IEllipseEntity) : entity, params.chordToleranceMm / linearScale(matrix), mirrored)
    if (drawn === undefined) {
      const entityType = entity.type.slice(0, 20)
      reportNotCut({ code: 'dxf-entity-not-read', cause: `unsupported-${entityType.toLowerCase()}`, facts: { entityType } }, ...at(firstPointOf(entity)))
      continue
    }
    if ('problem' in drawn) {
      reportNotCut({ code: 'dxf-entity-not-read', cause: drawn.problem, facts: drawn.detail === undefined ? undefined : { detail: drawn.detail } }, ...at(firstPointOf(entity)))
      continue
    }
    const operation = mapper.operationFor(layerName, colour)
    if (operation === undefined) reportUnmapped(layerName, colour, ...at(firstPointOf(entity)))
    const effective = operation ?? params.unmappedStrokeOperation
    // DXF lines are strokes: the engrave layer or colour marks them along the line (strokeOperation), closed or open.
    if (effective !== 'ignore') elements.push({ pathData: drawn.pathData, matrix: mirrored ? multiply(matrix, scaling(-1, 1)) : matrix, operation: strokeOperation(effective), filled: false, fillRule: 'nonzero' })
  }
  return { elements }

  function expandInsert(insert: IInsertEntity, matrix: Matrix, layerName: string, colour: number, outer: BlockChain | undefined): void {
    const block = dxf.blocks?.[insert.name]
    if (!block) return
    for (let chain = outer; chain; chain = chain.outer) {
      if (chain.name === insert.name) throw new AnalysisInputError('tooComplex', `The block "${insert.name.slice(0, 40)}" inserts itself, so the drawing never ends. Fix the block in your CAD program.`)
    }
    const depth = (outer?.depth ?? 0) + 1
    if (depth > MAX_INSERT_DEPTH) throw new AnalysisInputError('tooComplex', `This drawing nests blocks more than ${MAX_INSERT_DEPTH} deep, which Kerfbook does not analyse. Explode the blocks in your CAD program.`)
    const columns = Math.max(1, insert.columnCount ?? 1)
    const rows = Math.max(1, insert.rowCount ?? 1)
    if (columns * rows * Math.max(1, block.entities?.length ?? 0) + visited > MAX_VISITED_ENTITIES) {
      throw new AnalysisInputError('tooComplex', 'This drawing repeats blocks too often to analyse (its INSERTs multiply into millions of entities).')
    }
    const blockChain = { name: insert.name, depth, outer }
    for (let row = rows - 1; row >= 0; row--) {
      for (let column = columns - 1; column >= 0; column--) {
        pushEntities(block.entities, multiply(matrix, insertMatrix(insert, block.position, column, row)), {
          insertLayer: layerName,
          byBlockColour: colour,
          blockChain,
        })
      }
    }
  }

  function reportNotCut(kind: Pick<GroupSpec, 'code' | 'cause' | 'facts'>, x: number, y: number): void {
    findings.group({ ...kind, severity: 'warning', facts: { format: 'dxf', ...kind.facts } }).add(x, y)
  }

  function reportUnmapped(layerName: string, colour: number, x: number, y: number): void {
    const layer = layerName.slice(0, 40)
    const hex = colourHex(colour)
    const label = `${layer} ${hex}`
    let sites = reportedMappings.get(label)
    if (sites === undefined) {
      sites = findings.group({ code: 'unmapped-colour', severity: 'warning', cause: label, facts: { format: 'dxf', layer, colour: hex, countedAs: params.unmappedStrokeOperation } })
      reportedMappings.set(label, sites)
      sites.add(x, y)
    }
    sites.addToFact('lines', 1)
  }
}

/**
 * An INSERT places its block's geometry, taken relative to the block's base
 * point, scaled, turned and moved to the insertion point; an array insert
 * repeats it at column and row spacing along the turned axes (DXF
 * reference, INSERT, from memory).
 */
function insertMatrix(insert: IInsertEntity, basePoint: IPoint | undefined, column: number, row: number): Matrix {
  const rotationRad = ((insert.rotation ?? 0) * Math.PI) / 180
  const cos = Math.cos(rotationRad)
  const sin = Math.sin(rotationRad)
  const position = insert.position ?? { x: 0, y: 0 }
  const offsetX = column * (insert.columnSpacing ?? 0)
  const offsetY = row * (insert.rowSpacing ?? 0)
  const placed: Matrix = [cos, sin, -sin, cos, position.x + cos * offsetX - sin * offsetY, position.y + sin * offsetX + cos * offsetY]
  return multiply(multiply(placed, scaling(insert.xScale ?? 1, insert.yScale ?? 1)), translation(-(basePoint?.x ?? 0), -(basePoint?.y ?? 0)))
}

/**
 * Entity types whose points are in their object coordinate system (OCS), set
 * by the extrusion direction (groups 210/220/230); a POLYLINE only when it is
 * 2D. LINE, POINT, 3D polylines and meshes are in world coordinates (DXF
 * reference, Object Coordinate Systems); ELLIPSE, SPLINE and MTEXT are in
 * world coordinates too, with the extrusion as their normal.
 */
const IN_OBJECT_COORDINATES = new Set(['CIRCLE', 'ARC', 'SOLID', 'TRACE', 'TEXT', 'ATTRIB', 'ATTDEF', 'SHAPE', 'INSERT', 'POLYLINE', 'LWPOLYLINE', 'HATCH', 'IMAGE'])

/**
 * The entity's matrix into mm: the parent's, after the entity's OCS for the
 * types that have one; undefined when its plane is tilted out of the
 * drawing plane. An ELLIPSE's points are in world coordinates but it runs
 * counter-clockwise about its extrusion, so it is read in the OCS of that
 * extrusion (`ellipseInObjectCoordinates`) and placed by the same matrix.
 */
function withObjectCoordinates(matrix: Matrix, entity: IEntity): Matrix | undefined {
  const inObjectCoordinates = IN_OBJECT_COORDINATES.has(entity.type) && !(entity as IPolylineEntity).is3dPolyline
  if (!inObjectCoordinates && entity.type !== 'ELLIPSE') return matrix
  const extrusion = extrusionOf(entity)
  // Almost every entity lies in the world's own plane: no matrix to multiply.
  if (extrusion.x === 0 && extrusion.y === 0 && extrusion.z > 0) return matrix
  const objectToWorld = objectAxes(extrusion)
  return objectToWorld && multiply(matrix, objectToWorld)
}

/**
 * A LINE or 3D POLYLINE (world coordinates) whose points differ in Z by more
 * than the tolerance leaves the drawing plane: projecting it would shorten
 * it, so it is reported like an entity in a tilted plane.
 */
function isTiltedInWorld(entity: IEntity, toleranceUnits: number): boolean {
  if (entity.type !== 'LINE' && !(entity.type === 'POLYLINE' && (entity as IPolylineEntity).is3dPolyline)) return false
  const vertices = (entity as IPolylineEntity).vertices ?? []
  let low = Infinity
  let high = -Infinity
  for (const vertex of vertices) {
    const z = vertex.z ?? 0
    if (z < low) low = z
    if (z > high) high = z
  }
  return high - low > toleranceUnits
}

/** The extrusion direction as dxf-parser (or the raw group reader) gives it, +Z when absent. */
function extrusionOf(entity: IEntity): IPoint {
  const fields = entity as IEntity & { extrusionDirection?: IPoint; extrusionDirectionX?: number; extrusionDirectionY?: number; extrusionDirectionZ?: number }
  if (fields.extrusionDirection) return { x: fields.extrusionDirection.x ?? 0, y: fields.extrusionDirection.y ?? 0, z: fields.extrusionDirection.z ?? 0 }
  return { x: fields.extrusionDirectionX ?? 0, y: fields.extrusionDirectionY ?? 0, z: fields.extrusionDirectionZ ?? 1 }
}

/**
 * The OCS axes of an extrusion direction N in the drawing plane, as the matrix
 * from OCS (x, y) to world (x, y), by the DXF reference's arbitrary axis
 * algorithm: Ax = Wy × N when |Nx| and |Ny| are both below 1/64, else
 * Wz × N; Ay = N × Ax; both normalised. The OCS origin is the world's.
 * Undefined when N leaves the drawing plane's normal (a tilted entity).
 */
export function objectAxes(extrusion: IPoint): Matrix | undefined {
  const length = Math.hypot(extrusion.x, extrusion.y, extrusion.z ?? 0)
  if (!(length > 0)) return IDENTITY
  const n = [extrusion.x / length, extrusion.y / length, (extrusion.z ?? 0) / length] as const
  if (Math.abs(n[2]) < PLANAR_EXTRUSION_Z) return undefined
  const arbitraryBound = 1 / 64
  const ax = normalised(Math.abs(n[0]) < arbitraryBound && Math.abs(n[1]) < arbitraryBound ? cross([0, 1, 0], n) : cross([0, 0, 1], n))
  const ay = normalised(cross(n, ax))
  return [ax[0], ax[1], ay[0], ay[1], 0, 0]
}

type Vector3 = readonly [number, number, number]

function cross(a: Vector3, b: Vector3): Vector3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]
}

function normalised(v: Vector3): Vector3 {
  const length = Math.hypot(v[0], v[1], v[2])
  return [v[0] / length, v[1] / length, v[2] / length]
}

/**
 * An ELLIPSE with its world centre and major axis taken into the OCS of its
 * extrusion (`objectAxes` is a rotation or reflection, so its inverse is its
 * transpose), where it runs counter-clockwise like every OCS arc.
 */
function ellipseInObjectCoordinates(ellipse: IEllipseEntity): IEllipseEntity {
  const axes = objectAxes(extrusionOf(ellipse))
  if (!axes || !ellipse.center || !ellipse.majorAxisEndPoint) return ellipse
  const toObject = (point: IPoint): IPoint => ({ x: axes[0] * point.x + axes[1] * point.y, y: axes[2] * point.x + axes[3] * point.y, z: point.z })
  return { ...ellipse, center: toObject(ellipse.center), majorAxisEndPoint: toObject(ellipse.majorAxisEndPoint) }
}

/** An upper bound of how much the matrix stretches lengths (its Frobenius norm), to turn mm tolerances into entity units. */
function linearScale(matrix: Matrix): number {
  return Math.hypot(matrix[0], matrix[1], matrix[2], matrix[3]) || 1
}

/** Where to point a finding at: the entity's first point that dxf-parser (or its raw groups) gives. */
function firstPointOf(entity: IEntity): IPoint | undefined {
  const fields = entity as IEntity & Partial<Record<'startPoint' | 'position' | 'center' | 'anchorPoint' | 'middleOfText', IPoint>> & { vertices?: IPoint[] }
  const point = fields.startPoint ?? fields.position ?? fields.center ?? fields.middleOfText ?? fields.anchorPoint ?? fields.vertices?.[0]
  if (point) return point
  const groups = (entity as RawGroupEntity).groups
  const x = groups?.find(([code]) => code === 10)?.[1]
  const y = groups?.find(([code]) => code === 20)?.[1]
  return typeof x === 'number' && typeof y === 'number' ? { x, y, z: 0 } : undefined
}
