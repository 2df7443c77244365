// The corpus: small SVG and DXF files of our own (tests/fixtures/corpus/), one per feature the readers must get right
// (issue 16, items 1–7), each with its cut length, contour counts and box from an outside reference named beside it:
// the SVG 1.1/2 and DXF specifications, CSS Values 3, closed forms, or an independent package (bezier-js for Bézier
// lengths and boxes, @flatten-js/core for arcs). The engine's frame is SVG's: mm, y down; a DXF point (x, y) is at
// (x, −y) mm.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { Arc, point } from '@flatten-js/core'
import { Bezier } from 'bezier-js'
import { describe, expect, it } from 'vitest'
import { AnalysisInputError, type AnalysisParams, type AnalysisResult, analyzeCutFile, withDefaults } from '../../server/analysis/index'
import { activeContentIn } from '../../server/utils/active-content'
import { ramanujanPerimeter } from './helpers'

const CORPUS = join(__dirname, '..', 'fixtures', 'corpus')
type Box = [x: number, y: number, width: number, height: number]

interface CorpusCase {
  file: string
  /** Where the expected numbers come from. */
  reference: string
  cutMm?: number
  closed?: number
  open?: number
  box?: Box
  scoreMm?: number
  engraveMm2?: number
  /** Finding codes the file must produce. */
  codes?: string[]
  /** Size of the one small-hole finding. */
  smallHoleMm?: number
  /** Refused with this kind, and a message matching the pattern. */
  refused?: { kind: string; message?: RegExp }
  /** Allowed length error: mm plus a fraction of the length (default 0.01 mm + 1e-4, the chord tolerance's order). */
  lengthSlack?: { mm: number; relative: number }
  boxSlackMm?: number
}

/** Bézier length and box by bezier-js; several pieces are summed and their boxes joined. */
function bezierPieces(...pieces: number[][]): { length: number; box: Box } {
  let length = 0
  let [minX, minY, maxX, maxY] = [Infinity, Infinity, -Infinity, -Infinity]
  for (const coordinates of pieces) {
    const curve = new Bezier(...(coordinates as [number, number, number, number, number, number]))
    length += curve.length()
    const { x, y } = curve.bbox()
    ;[minX, minY, maxX, maxY] = [Math.min(minX, x.min), Math.min(minY, y.min), Math.max(maxX, x.max), Math.max(maxY, y.max)]
  }
  return { length, box: [minX, minY, maxX - minX, maxY - minY] }
}

/** A box given in DXF's y-up coordinates, seen in the engine's y-down frame. */
const dxfBox = (minX: number, minY: number, maxX: number, maxY: number): Box => [minX, -maxY, maxX - minX, maxY - minY]

/** A rectangle rotated by `deg` about its origin corner, then moved (SVG 1.1 §7.5: rotate(a) is [cos a, sin a, −sin a, cos a]). */
function rotatedRectBox(width: number, height: number, deg: number, moveX: number, moveY: number): Box {
  const a = (deg * Math.PI) / 180
  const corners = (
    [
      [0, 0],
      [width, 0],
      [width, height],
      [0, height],
    ] as const
  ).map(([x, y]): [number, number] => [x * Math.cos(a) - y * Math.sin(a) + moveX, x * Math.sin(a) + y * Math.cos(a) + moveY])
  const xs = corners.map(([x]) => x)
  const ys = corners.map(([, y]) => y)
  return [Math.min(...xs), Math.min(...ys), Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys)]
}

const quadratic = bezierPieces([10, 80, 52.5, 10, 95, 80])
const cubic = bezierPieces([10, 90, 30, 10, 70, 10, 90, 90])
// S reflects the previous second control point about the current point (SVG 1.1 §8.3.6): (40, 10) about (50, 50) is (60, 90).
const smooth = bezierPieces([10, 50, 20, 10, 40, 10, 50, 50], [50, 50, 60, 90, 80, 90, 90, 50])
// A clamped B-spline with knots 0…0 1…1 is the Bézier curve of its control points (Piegl & Tiller, The NURBS Book, §2.3).
const splineQuadratic = bezierPieces([0, 0, 20, 40, 40, 0])
const splineCubic = bezierPieces([0, 0, 10, 30, 30, 30, 40, 0])
// Bulge 1 is a half turn counter-clockwise (DXF reference, LWPOLYLINE group 42: bulge = tan(θ/4)) from (0, 0) to (20, 0).
const bulgeArc = new Arc(point(10, 0), 10, Math.PI, 2 * Math.PI, true)
const PLATE_MM = 2 * (50 + 30)

const SVG_CASES: CorpusCase[] = [
  { file: '01-rect', reference: 'SVG 1.1 §9.2: perimeter 2(w + h)', cutMm: 120, closed: 1, open: 0, box: [10, 10, 40, 20] },
  { file: '02-rect-rounded', reference: 'SVG 1.1 §9.2: straight sides less 8r, plus four quarter circles 2πr', cutMm: 120 - 8 * 5 + 2 * Math.PI * 5, closed: 1, box: [10, 10, 40, 20] },
  { file: '03-rect-rounded-clamped', reference: 'SVG 1.1 §9.2: ry = rx, each clamped to half its side (20, 10), so the rect is an ellipse; Ramanujan', cutMm: ramanujanPerimeter(20, 10), closed: 1, box: [10, 10, 40, 20] },
  { file: '04-circle', reference: 'SVG 1.1 §9.3; circumference 2πr', cutMm: 2 * Math.PI * 15, closed: 1, box: [35, 35, 30, 30] },
  { file: '05-ellipse', reference: 'SVG 1.1 §9.4; perimeter by Ramanujan (1914)', cutMm: ramanujanPerimeter(30, 10), closed: 1, box: [20, 30, 60, 20] },
  { file: '06-line', reference: 'SVG 1.1 §9.5; a 30-40-50 triangle', cutMm: 50, closed: 0, open: 1, box: [10, 10, 30, 40] },
  { file: '07-polyline', reference: 'SVG 1.1 §9.6: open, 30 + 40', cutMm: 70, closed: 0, open: 1, box: [0, 0, 30, 40] },
  { file: '08-polygon', reference: 'SVG 1.1 §9.7: closed, 30 + 40 + 50', cutMm: 120, closed: 1, open: 0, box: [0, 0, 30, 40] },
  { file: '09-quadratic', reference: 'bezier-js length() and bbox()', cutMm: quadratic.length, open: 1, box: quadratic.box },
  { file: '10-cubic', reference: 'bezier-js length() and bbox()', cutMm: cubic.length, open: 1, box: cubic.box },
  { file: '11-smooth-cubic', reference: 'SVG 1.1 §8.3.6 (S reflects the control point); bezier-js', cutMm: smooth.length, open: 1, box: smooth.box },
  { file: '12-arc-semicircle', reference: 'SVG 1.1 §F.6.5: sweep 1 runs through the top; half circumference πr', cutMm: Math.PI * 20, open: 1, box: [10, 30, 40, 20] },
  { file: '13-relative', reference: 'SVG 1.1 §8.3: relative commands; 30 × 20 rectangle', cutMm: 100, closed: 1, box: [10, 10, 30, 20] },
  { file: '14-rotate', reference: 'SVG 1.1 §7.5: rotate(30) matrix on the corners; length kept', cutMm: 120, closed: 1, box: rotatedRectBox(40, 20, 30, 50, 50) },
  { file: '15-scale', reference: 'SVG 1.1 §7.5: scale(2) doubles radius and centre', cutMm: 2 * Math.PI * 20, closed: 1, box: [30, 30, 40, 40] },
  { file: '16-skew', reference: 'SVG 1.1 §7.5: skewX(45) moves x by y·tan 45°: (0,0)–(40,40)', cutMm: 40 * Math.SQRT2, open: 1, box: [10, 10, 40, 40] },
  { file: '17-viewbox-scale', reference: 'SVG 1.1 §7.7: viewBox 1000 units in 100 mm', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
  { file: '18-px-document', reference: 'CSS Values 3 §6.2: 96 px = 1 in = 25.4 mm', cutMm: 25.4, open: 1, box: [0, 25.4, 25.4, 0] },
  { file: '19-inch-document', reference: 'CSS Values 3 §6.2: 1 in = 25.4 mm', cutMm: 2 * (50.8 + 25.4), closed: 1, box: [25.4, 25.4, 50.8, 25.4] },
  { file: '20-use-symbol', reference: 'SVG 1.1 §5.5, §5.6: a symbol is a viewport sized by the use (10 → 20)', cutMm: 160, closed: 2, box: [10, 10, 60, 20] },
  { file: '21-use-group', reference: 'SVG 1.1 §5.6: use x/y translate', cutMm: 2 * 2 * Math.PI * 5, closed: 2, box: [15, 15, 30, 10] },
  { file: '22-stray-line', reference: 'issue 16 item 1; closed forms: plate 160, hole 2π·1, line 10', cutMm: PLATE_MM + 2 * Math.PI + 10, closed: 2, open: 1, box: [0, 0, 80, 30], codes: ['narrow-bridge', 'small-hole'] },
  { file: '23-stray-line-control', reference: 'the same part without the stray line', cutMm: PLATE_MM + 2 * Math.PI, closed: 2, open: 0, box: [0, 0, 50, 30], codes: ['narrow-bridge', 'small-hole'] },
  { file: '24-use-sizes-svg', reference: 'SVG 2 §5.6: a use\'s width and height replace those of the svg it refers to', cutMm: 160, closed: 1, box: [10, 10, 40, 40] },
  { file: '25-nested-svg-fills', reference: 'SVG 2 §7 (width, height auto = 100 %): a nested svg fills its parent', cutMm: 320, closed: 1, box: [10, 10, 80, 80] },
  { file: '26-nested-svg-sized', reference: 'SVG 1.1 §7.9, §7.8 (preserveAspectRatio none)', cutMm: 150, closed: 1, box: [10, 20, 50, 25] },
  { file: '27-switch-first', reference: 'SVG 1.1 §5.8.2: only the first child whose conditions pass', cutMm: 30, closed: 0, open: 1, box: [10, 10, 30, 0] },
  { file: '28-switch-language', reference: 'SVG 1.1 §5.8.5: systemLanguage "en" passes for an English reader', cutMm: 80, closed: 1, box: [10, 10, 20, 20] },
  { file: '29-aspect-default', reference: 'SVG 1.1 §7.8: default xMidYMid meet (scale 2, centred: y + 50)', cutMm: 600, closed: 1, box: [0, 50, 200, 100] },
  { file: '30-aspect-xminymin', reference: 'SVG 1.1 §7.8: xMinYMin meet', cutMm: 600, closed: 1, box: [0, 0, 200, 100] },
  { file: '31-aspect-none', reference: 'SVG 1.1 §7.8: none stretches (2 × 4)', cutMm: 800, closed: 1, box: [0, 0, 200, 200] },
  { file: '32-aspect-xmaxymax-slice', reference: 'SVG 1.1 §7.8: slice takes the larger scale (2), yMax aligns bottoms: y − 100', cutMm: 800, closed: 1, box: [0, -100, 200, 200] },
  { file: '33-character-references', reference: 'XML 1.0 §4.1: &#10; and &#x9; are whitespace, &#x23; is #', cutMm: 110, open: 1, box: [10, 10, 80, 30] },
  { file: '34-units-on-shapes', reference: 'CSS Values 3 §6.2 and SVG 1.1 §7.10: mm and in on a px user space', cutMm: 60, closed: 1, box: [10, 25.4, 20, 10] },
  { file: '35-percent-on-shapes', reference: 'SVG 1.1 §7.10: r % of √((w² + h²)/2) = 10', cutMm: 2 * Math.PI * 10, closed: 1, box: [40, 40, 20, 20] },
  { file: '36-prefixed-root', reference: 'Namespaces in XML 1.0: svg: bound to the SVG namespace', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
  { file: '37-title-desc-text', reference: 'XML 1.0 §2.4: character data is not markup', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
  { file: '38-display-none-root', reference: 'SVG 1.1 §11.5: display none renders neither the element nor its children', refused: { kind: 'empty' } },
  { file: '39-display-none-group', reference: 'SVG 1.1 §11.5', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
  { file: '40-engrave-stroke-closed', reference: 'server/analysis/README.md, Operations: an engrave stroke is marked as a line; perimeter 120', cutMm: 0, closed: 0, open: 0, scoreMm: 120, engraveMm2: 0, box: [10, 10, 40, 20] },
  { file: '41-engrave-stroke-open', reference: 'the same decision for an open stroke: 40 + 20', cutMm: 0, scoreMm: 60, engraveMm2: 0, box: [10, 10, 40, 20] },
  { file: '42-engrave-fill', reference: 'SVG 1.1 §11.3 fill; area w·h', cutMm: 0, scoreMm: 0, engraveMm2: 800, box: [10, 10, 40, 20] },
  { file: '43-small-hole-arcs', reference: 'closed forms: plate 160 + circle π·1; the hole\'s diameter 1', cutMm: PLATE_MM + Math.PI, closed: 2, box: [0, 0, 50, 30], codes: ['small-hole'], smallHoleMm: 1 },
  { file: '44-small-hole-6-decimals', reference: 'regular 64-gon perimeter 64·2r·sin(π/64); circumscribed diameter 1', cutMm: PLATE_MM + 64 * Math.sin(Math.PI / 64), closed: 2, box: [0, 0, 50, 30], codes: ['small-hole'], smallHoleMm: 1, lengthSlack: { mm: 1e-4, relative: 0 } },
  { file: '45-visibility-hidden', reference: 'SVG 1.1 §11.5: visibility hidden is not painted', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
  { file: '46-css-classes', reference: 'CSS 2.1 class selectors (SVG 1.1 §6.4)', cutMm: 120, scoreMm: 50, closed: 1, box: [10, 10, 50, 30] },
  { file: '47-nested-groups', reference: 'SVG 1.1 §7.4: nested transforms multiply', cutMm: 120, closed: 1, box: [10, 10, 40, 20] },
]

const DXF_CASES: CorpusCase[] = [
  { file: '01-line', reference: 'DXF reference, LINE; a 30-40-50 triangle', cutMm: 50, open: 1, box: dxfBox(0, 0, 30, 40) },
  { file: '02-circle', reference: 'DXF reference, CIRCLE; 2πr', cutMm: 2 * Math.PI * 10, closed: 1, box: dxfBox(40, 40, 60, 60) },
  { file: '03-arc', reference: 'DXF reference, ARC: counter-clockwise 0°–90°; πr/2', cutMm: Math.PI * 10, open: 1, box: dxfBox(0, 0, 20, 20) },
  { file: '04-lwpolyline-closed', reference: 'DXF reference, LWPOLYLINE flag 1 closed', cutMm: 120, closed: 1, box: dxfBox(0, 0, 40, 20) },
  { file: '05-lwpolyline-bulge', reference: '@flatten-js/core Arc (centre (10, 0), r 10, π to 2π counter-clockwise)', cutMm: bulgeArc.length, open: 1, box: dxfBox(bulgeArc.box.xmin, bulgeArc.box.ymin, bulgeArc.box.xmax, bulgeArc.box.ymax) },
  { file: '06-ellipse', reference: 'DXF reference, ELLIPSE; Ramanujan', cutMm: ramanujanPerimeter(20, 10), closed: 1, box: dxfBox(-20, -10, 20, 10) },
  { file: '07-spline-quadratic', reference: 'clamped B-spline = Bézier; bezier-js', cutMm: splineQuadratic.length, open: 1, box: dxfBox(splineQuadratic.box[0], splineQuadratic.box[1], splineQuadratic.box[0] + splineQuadratic.box[2], splineQuadratic.box[1] + splineQuadratic.box[3]) },
  { file: '08-spline-cubic', reference: 'clamped B-spline = Bézier; bezier-js', cutMm: splineCubic.length, open: 1, box: dxfBox(splineCubic.box[0], splineCubic.box[1], splineCubic.box[0] + splineCubic.box[2], splineCubic.box[1] + splineCubic.box[3]) },
  { file: '09-spline-fit-points-closed', reference: 'DXF reference, SPLINE fit points: through 12 points of a circle, 2πR (cubic interpolation within 5e-4)', cutMm: 2 * Math.PI * 50, closed: 1, box: dxfBox(-50, -50, 50, 50), lengthSlack: { mm: 0, relative: 5e-4 }, boxSlackMm: 0.5 },
  { file: '10-insert-scaled-rotated', reference: 'DXF reference, INSERT: scale 2, then 90° counter-clockwise, then move to (100, 0)', cutMm: 60, closed: 1, box: dxfBox(90, 0, 100, 20) },
  { file: '11-inches', reference: 'DXF $INSUNITS 1 = inches; 25.4 mm', cutMm: 25.4, open: 1, box: dxfBox(0, 0, 25.4, 0) },
  { file: '12-line-extrusion-down', reference: 'DXF reference, OCS: LINE points are world coordinates whatever the extrusion', cutMm: 20, open: 1, box: dxfBox(10, 5, 30, 5) },
  { file: '13-circle-extrusion-down', reference: 'DXF arbitrary axis algorithm: N = −Z gives OCS (x, y) = world (−x, y)', cutMm: 2 * Math.PI * 5, closed: 1, box: dxfBox(-25, 5, -15, 15) },
  { file: '14-arc-extrusion-down', reference: 'arbitrary axis algorithm; πr/2', cutMm: (Math.PI * 5) / 2, open: 1, box: dxfBox(-15, 0, -10, 5) },
  { file: '15-ellipse-extrusion-down', reference: 'DXF ELLIPSE runs counter-clockwise about its extrusion: below the axis for −Z; Ramanujan / 2', cutMm: ramanujanPerimeter(10, 5) / 2, open: 1, box: dxfBox(-10, -5, 10, 0) },
  { file: '16-tilted-3d-polyline', reference: 'DXF reference, OCS: a 3D POLYLINE is in world coordinates; its Z varies, so only the LINE is cut', cutMm: 10, open: 1, closed: 0, box: dxfBox(0, 20, 10, 20), codes: ['dxf-not-planar'] },
  { file: '17-polyline-bulges-closed', reference: 'DXF bulge 1 = half turn: a 20 × 10 slot with round ends, 40 + 2π·5', cutMm: 40 + 2 * Math.PI * 5, closed: 1, box: dxfBox(-5, 0, 25, 10) },
  { file: '18-frozen-layer', reference: 'DXF reference, LAYER flag 1 frozen: not drawn', cutMm: 10, open: 1, box: dxfBox(0, 0, 10, 0) },
  { file: '19-lwpolyline-extrusion-down-plate', reference: 'arbitrary axis algorithm for the plate and its Ø2 hole; 160 + 2π', cutMm: PLATE_MM + 2 * Math.PI, closed: 2, box: dxfBox(-50, 0, 0, 30), codes: ['small-hole'], smallHoleMm: 2 },
  { file: '20-binary', reference: 'DXF reference, Binary DXF Files: the sentinel "AutoCAD Binary DXF"', refused: { kind: 'notSvg', message: /binary DXF.*ASCII DXF/ } },
]

const SVG_PARAMS = withDefaults()
const DXF_PARAMS = withDefaults({ dxfLayerMapping: [{ layer: 'CUT', operation: 'cut' }] })

function check(kind: 'svg' | 'dxf', expected: CorpusCase, params: AnalysisParams) {
  const text = readFileSync(join(CORPUS, kind, `${expected.file}.${kind}`), 'utf8')
  if (expected.refused) {
    let refusal: unknown
    try {
      analyzeCutFile(text, params)
    } catch (error) {
      refusal = error
    }
    expect(refusal, 'refused').toBeInstanceOf(AnalysisInputError)
    expect((refusal as AnalysisInputError).kind).toBe(expected.refused.kind)
    if (expected.refused.message) expect((refusal as AnalysisInputError).message).toMatch(expected.refused.message)
    return
  }
  const result: AnalysisResult = analyzeCutFile(text, params)
  const slack = expected.lengthSlack ?? { mm: 0.01, relative: 1e-4 }
  const near = (actual: number, wanted: number, label: string) => expect(Math.abs(actual - wanted), `${label}: ${actual} vs ${wanted}`).toBeLessThanOrEqual(slack.mm + slack.relative * wanted)
  if (expected.cutMm !== undefined) near(result.cut.lengthMm, expected.cutMm, 'cut length')
  if (expected.scoreMm !== undefined) near(result.score.lengthMm, expected.scoreMm, 'score length')
  if (expected.engraveMm2 !== undefined) near(result.engrave.areaMm2, expected.engraveMm2, 'engrave area')
  if (expected.closed !== undefined) expect(result.cut.closedContours, 'closed contours').toBe(expected.closed)
  if (expected.open !== undefined) expect(result.cut.openContours, 'open contours').toBe(expected.open)
  if (expected.box) {
    const boxSlack = expected.boxSlackMm ?? 0.02
    const { x, y, width, height } = result.bbox
    ;[x, y, width, height].forEach((value, index) => expect(Math.abs(value - expected.box![index]!), `box[${index}]: ${value} vs ${expected.box![index]}`).toBeLessThanOrEqual(boxSlack))
  }
  const codes = result.findingGroups.map((group) => group.code)
  for (const code of expected.codes ?? []) expect(codes).toContain(code)
  if (expected.smallHoleMm !== undefined) {
    const group = result.findingGroups.find((candidate) => candidate.code === 'small-hole')!
    expect(group.count).toBe(1)
    expect(Math.abs(result.sites.value[group.firstSite]! - expected.smallHoleMm)).toBeLessThan(1e-3 * expected.smallHoleMm)
  }
}

describe('corpus: SVG', () => {
  it('holds at least 40 files', () => expect(SVG_CASES.length).toBeGreaterThanOrEqual(40))
  it.each(SVG_CASES.map((expected) => [expected.file, expected] as const))('%s', (_file, expected) => check('svg', expected, SVG_PARAMS))

  it('37: the upload screen passes a title and description that read like event handlers', () => {
    expect(activeContentIn(readFileSync(join(CORPUS, 'svg', '37-title-desc-text.svg'), 'utf8'), 'svg')).toEqual([])
  })
})

describe('corpus: DXF', () => {
  it('holds at least 15 files', () => expect(DXF_CASES.length).toBeGreaterThanOrEqual(15))
  it.each(DXF_CASES.map((expected) => [expected.file, expected] as const))('%s', (_file, expected) => check('dxf', expected, DXF_PARAMS))
})
