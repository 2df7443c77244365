import { AnalysisInputError } from './errors'
import { parseNumberList } from './numbers'
import { parseUserLength } from './units'
import type { ViewportSize } from './viewport'
import type { XmlNode } from './xmlTree'

/**
 * Path data equivalent to a basic shape, following SVG 1.1 §9 (rect corners
 * with rx/ry, circle, ellipse, line, polyline, polygon); undefined when the
 * shape draws nothing (zero size, as the specification says).
 */
export function shapeToPathData(node: XmlNode, viewport: ViewportSize): string | undefined {
  // Lengths may carry units or be percentages of the viewport (SVG 1.1 §7.10): x-like of its width, y-like of its
  // height, anything else (r) of its normalised diagonal √((w² + h²)/2).
  const diagonal = viewport.width === undefined || viewport.height === undefined ? undefined : Math.sqrt((viewport.width ** 2 + viewport.height ** 2) / 2)
  const percentOf = (name: string) => (HORIZONTAL.has(name) ? viewport.width : VERTICAL.has(name) ? viewport.height : diagonal)
  const attribute = (name: string, fallback = 0) => parseUserLength(node.attributes[name], name, percentOf(name), fallback)
  // SVG 2's rx/ry="auto" is the same as absent.
  const givenLength = (name: string) => (node.attributes[name] === undefined || node.attributes[name].trim() === 'auto' ? undefined : attribute(name))
  switch (node.name) {
    case 'path':
      return node.attributes.d
    case 'rect':
      return rectPath(attribute('x'), attribute('y'), nonNegative(attribute('width'), 'width'), nonNegative(attribute('height'), 'height'), givenLength('rx'), givenLength('ry'))
    case 'circle': {
      const r = nonNegative(attribute('r'), 'r')
      return r > 0 ? ellipsePath(attribute('cx'), attribute('cy'), r, r) : undefined
    }
    case 'ellipse': {
      const rx = nonNegative(attribute('rx'), 'rx')
      const ry = nonNegative(attribute('ry'), 'ry')
      return rx > 0 && ry > 0 ? ellipsePath(attribute('cx'), attribute('cy'), rx, ry) : undefined
    }
    case 'line':
      return `M${attribute('x1')} ${attribute('y1')}L${attribute('x2')} ${attribute('y2')}`
    case 'polyline':
    case 'polygon':
      return pointsPath(node.attributes.points ?? '', node.name === 'polygon')
    default:
      return undefined
  }
}

const HORIZONTAL = new Set(['x', 'cx', 'x1', 'x2', 'width', 'rx'])
const VERTICAL = new Set(['y', 'cy', 'y1', 'y2', 'height', 'ry'])

function nonNegative(value: number, attributeName: string): number {
  if (value < 0) throw new AnalysisInputError('badSize', `A shape in the drawing has a negative ${attributeName} (${value}); fix it in your drawing program.`)
  return value
}

function rectPath(x: number, y: number, width: number, height: number, rxAttribute: number | undefined, ryAttribute: number | undefined): string | undefined {
  if (width === 0 || height === 0) return undefined
  // SVG 1.1 §9.2: a missing rx/ry takes the other's value; both are clamped to half the side.
  const rxGiven = rxAttribute === undefined ? undefined : nonNegative(rxAttribute, 'rx')
  const ryGiven = ryAttribute === undefined ? undefined : nonNegative(ryAttribute, 'ry')
  const rx = Math.min(rxGiven ?? ryGiven ?? 0, width / 2)
  const ry = Math.min(ryGiven ?? rxGiven ?? 0, height / 2)
  if (rx === 0 || ry === 0) return `M${x} ${y}H${x + width}V${y + height}H${x}Z`
  return (
    `M${x + rx} ${y}H${x + width - rx}A${rx} ${ry} 0 0 1 ${x + width} ${y + ry}` +
    `V${y + height - ry}A${rx} ${ry} 0 0 1 ${x + width - rx} ${y + height}` +
    `H${x + rx}A${rx} ${ry} 0 0 1 ${x} ${y + height - ry}` +
    `V${y + ry}A${rx} ${ry} 0 0 1 ${x + rx} ${y}Z`
  )
}

function ellipsePath(cx: number, cy: number, rx: number, ry: number): string {
  return `M${cx + rx} ${cy}A${rx} ${ry} 0 0 1 ${cx - rx} ${cy}A${rx} ${ry} 0 0 1 ${cx + rx} ${cy}Z`
}

function pointsPath(points: string, close: boolean): string | undefined {
  const numbers = parseNumberList(points, 'points')
  // SVG 1.1 §9.7: an odd number of coordinates is an error; render what pairs up.
  const pairCount = Math.floor(numbers.length / 2)
  if (pairCount < 2) return undefined
  let pathData = `M${numbers[0]} ${numbers[1]}`
  for (let pair = 1; pair < pairCount; pair++) pathData += `L${numbers[pair * 2]} ${numbers[pair * 2 + 1]}`
  return close ? `${pathData}Z` : pathData
}
