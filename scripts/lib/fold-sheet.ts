// A generated fold sheet of invented units, for benchmarks: square panels on a grid of fold lines. Each
// fold line between two grid crossings is cut as two slits; each inner crossing has a round relief hole.
// The web left between the two slits of a fold line, and between a slit's end and the relief (or the
// sheet's edge), is the hinge that bends — drawn narrow on purpose: with the default 1.7 mm gap it is
// 1.5 mm after a 0.2 mm kerf, where 3 mm plywood asks for 3 mm. Written the way a drawing program
// exports it: element ids, absolute coordinates with three decimals.
import { seededRandom } from './seeded-random'

export interface FoldSheetOptions {
  unitsAcross: number
  unitsDown: number
  /** Side of one square panel (the fold lines' spacing), mm. */
  pitchMm?: number
  /** Centre-line gap at every hinge, mm (the hinge's width is this less the kerf). */
  hingeGapMm?: number
  /** Radius of the relief hole at each inner crossing, mm. */
  reliefRadiusMm?: number
  /** Stroke colour of the cuts (the demo workshop maps #ff6a00 to "cut"). */
  cutColour?: string
  /**
   * Seed of a non-repeating variant: every crossing moves a little, and every unit's hinge gaps and relief
   * radius vary a little, deterministically for the seed. Without it every unit is the same.
   */
  jitterSeed?: number
}

export interface FoldSheet {
  svg: string
  units: number
  /** Closed and open cut contours drawn: slits, reliefs and the outline. */
  contours: number
  slits: number
  reliefs: number
  /** Hinges drawn narrower than the gap's nominal width would allow on 3 mm plywood, by design: three per inner fold line. */
  hinges: number
  widthMm: number
  heightMm: number
}

const DEFAULTS = { pitchMm: 20, hingeGapMm: 1.7, reliefRadiusMm: 1, cutColour: '#ff6a00' }
/** How far a crossing may move, and how much gaps and radii may vary, in the non-repeating variant (mm). */
const NODE_JITTER_MM = 0.2
const GAP_JITTER_MM = 0.1
const RADIUS_JITTER_MM = 0.1

/** Three decimals, as drawing programs write coordinates. */
const mm = (value: number) => value.toFixed(3)

export function foldSheet(options: FoldSheetOptions): FoldSheet {
  const { unitsAcross, unitsDown } = options
  if (!Number.isInteger(unitsAcross) || !Number.isInteger(unitsDown) || unitsAcross < 1 || unitsDown < 1) throw new Error('units across and down must be whole numbers ≥ 1')
  const pitch = options.pitchMm ?? DEFAULTS.pitchMm
  const baseGap = options.hingeGapMm ?? DEFAULTS.hingeGapMm
  const baseRadius = options.reliefRadiusMm ?? DEFAULTS.reliefRadiusMm
  const random = options.jitterSeed === undefined ? null : seededRandom(options.jitterSeed)
  const vary = (value: number, span: number) => (random ? value + (random() * 2 - 1) * span : value)
  if (2 * baseRadius + 3 * (baseGap + GAP_JITTER_MM) + 2 * NODE_JITTER_MM >= pitch) throw new Error(`a ${pitch} mm panel leaves no room for two slits`)

  const widthMm = unitsAcross * pitch
  const heightMm = unitsDown * pitch
  // Crossings of the fold lines; those on the sheet's edge stay on it.
  const nodeX = new Float64Array((unitsAcross + 1) * (unitsDown + 1))
  const nodeY = new Float64Array(nodeX.length)
  const node = (column: number, row: number) => row * (unitsAcross + 1) + column
  for (let row = 0; row <= unitsDown; row++) {
    for (let column = 0; column <= unitsAcross; column++) {
      const inner = row > 0 && row < unitsDown && column > 0 && column < unitsAcross
      nodeX[node(column, row)] = inner ? vary(column * pitch, NODE_JITTER_MM) : column * pitch
      nodeY[node(column, row)] = inner ? vary(row * pitch, NODE_JITTER_MM) : row * pitch
    }
  }
  // Relief radius at each crossing: none on the edge, where the slit stops a hinge short of the outline.
  const radius = new Float64Array(nodeX.length)
  for (let row = 1; row < unitsDown; row++) for (let column = 1; column < unitsAcross; column++) radius[node(column, row)] = vary(baseRadius, RADIUS_JITTER_MM)

  let slits = 0
  let reliefs = 0
  let hinges = 0
  /** The fold line from crossing a to crossing b: hinge, slit, hinge in the middle, slit, hinge. */
  const foldLine = (id: string, a: number, b: number): string => {
    const ax = nodeX[a]!
    const ay = nodeY[a]!
    const length = Math.hypot(nodeX[b]! - ax, nodeY[b]! - ay)
    const ux = (nodeX[b]! - ax) / length
    const uy = (nodeY[b]! - ay) / length
    const gapA = vary(baseGap, GAP_JITTER_MM)
    const gapMiddle = vary(baseGap, GAP_JITTER_MM)
    const gapB = vary(baseGap, GAP_JITTER_MM)
    const at = (distance: number) => `${mm(ax + ux * distance)} ${mm(ay + uy * distance)}`
    const firstFrom = radius[a]! + gapA
    const firstTo = length / 2 - gapMiddle / 2
    const secondFrom = length / 2 + gapMiddle / 2
    const secondTo = length - radius[b]! - gapB
    slits += 2
    hinges += 3
    return `<path id="${id}1" d="M${at(firstFrom)}L${at(firstTo)}"/><path id="${id}2" d="M${at(secondFrom)}L${at(secondTo)}"/>`
  }

  const lines: string[] = []
  for (let row = 0; row < unitsDown; row++) {
    for (let column = 0; column < unitsAcross; column++) {
      // Each unit draws the fold lines along its top and left sides and the relief at its top-left crossing.
      const id = `u${row}-${column}`
      let unit = ''
      if (row > 0) unit += foldLine(`${id}-t`, node(column, row), node(column + 1, row))
      if (column > 0) unit += foldLine(`${id}-l`, node(column, row), node(column, row + 1))
      if (row > 0 && column > 0) {
        const n = node(column, row)
        unit += `<circle id="${id}-r" cx="${mm(nodeX[n]!)}" cy="${mm(nodeY[n]!)}" r="${mm(radius[n]!)}"/>`
        reliefs++
      }
      if (unit) lines.push(unit)
    }
  }
  const colour = options.cutColour ?? DEFAULTS.cutColour
  const svg = `<?xml version="1.0" encoding="UTF-8" standalone="no"?>
<svg xmlns="http://www.w3.org/2000/svg" width="${mm(widthMm)}mm" height="${mm(heightMm)}mm" viewBox="0 0 ${mm(widthMm)} ${mm(heightMm)}" version="1.1">
<g id="fold-sheet" fill="none" stroke="${colour}" stroke-width="0.100">
<rect id="outline" x="0.000" y="0.000" width="${mm(widthMm)}" height="${mm(heightMm)}"/>
${lines.join('\n')}
</g>
</svg>
`
  return { svg, units: unitsAcross * unitsDown, contours: slits + reliefs + 1, slits, reliefs, hinges, widthMm, heightMm }
}
