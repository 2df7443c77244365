import { AnalysisInputError } from './errors'
import { type Matrix, multiply, scaling, translation } from './matrix'
import { parseNumberList } from './numbers'
import { mmPerPixel, parseAbsoluteLengthMm } from './units'

export interface ViewBox {
  x: number
  y: number
  width: number
  height: number
}

export function parseViewBox(value: string | undefined): ViewBox | undefined {
  if (value === undefined || value.trim() === '') return undefined
  const numbers = parseNumberList(value, 'viewBox')
  if (numbers.length !== 4) {
    throw new AnalysisInputError('badSize', `The drawing's viewBox="${value.slice(0, 40)}" needs exactly four numbers.`)
  }
  const [x, y, width, height] = numbers as [number, number, number, number]
  if (width <= 0 || height <= 0) {
    throw new AnalysisInputError('badSize', 'The drawing\'s viewBox has a zero or negative width or height, so nothing in it can be drawn. Fix the document size in your drawing program.')
  }
  return { x, y, width, height }
}

/**
 * The matrix taking viewBox coordinates into a viewport of the given size,
 * following SVG 1.1 §7.8 (preserveAspectRatio: align, meet or slice, none).
 */
export function viewBoxMatrix(viewBox: ViewBox, viewportWidth: number, viewportHeight: number, preserveAspectRatio: string | undefined): Matrix {
  const scaleX = viewportWidth / viewBox.width
  const scaleY = viewportHeight / viewBox.height
  // An absent (or blank) attribute is the initial value, xMidYMid meet.
  const [align = 'xMidYMid', meetOrSlice = 'meet'] = (preserveAspectRatio ?? '').trim().split(/\s+/).filter((word) => word !== '' && word !== 'defer')
  if (align === 'none') {
    return multiply(scaling(scaleX, scaleY), translation(-viewBox.x, -viewBox.y))
  }
  const scale = meetOrSlice === 'slice' ? Math.max(scaleX, scaleY) : Math.min(scaleX, scaleY)
  const freeX = viewportWidth - viewBox.width * scale
  const freeY = viewportHeight - viewBox.height * scale
  const offsetX = align.includes('xMid') ? freeX / 2 : align.includes('xMax') ? freeX : 0
  const offsetY = align.includes('YMid') ? freeY / 2 : align.includes('YMax') ? freeY : 0
  return multiply(translation(offsetX, offsetY), multiply(scaling(scale, scale), translation(-viewBox.x, -viewBox.y)))
}

/** A viewport's size in the user units of the coordinate system it establishes; undefined sides are unknown. */
export interface ViewportSize {
  width: number | undefined
  height: number | undefined
}

/** The root viewport in its user units: the viewBox, else the width and height in px; what percentages inside the drawing refer to. */
export function rootViewportSize(attributes: Record<string, string>, dpi: number): ViewportSize {
  const viewBox = parseViewBox(attributes.viewBox)
  if (viewBox) return { width: viewBox.width, height: viewBox.height }
  const pixelMm = mmPerPixel(dpi)
  const widthMm = parseAbsoluteLengthMm(attributes.width, 'width', dpi)
  const heightMm = parseAbsoluteLengthMm(attributes.height, 'height', dpi)
  return { width: widthMm === undefined ? undefined : widthMm / pixelMm, height: heightMm === undefined ? undefined : heightMm / pixelMm }
}

/** The matrix from the root's user units to mm. */
export function rootMatrix(attributes: Record<string, string>, dpi: number): Matrix {
  const viewBox = parseViewBox(attributes.viewBox)
  const widthMm = parseAbsoluteLengthMm(attributes.width, 'width', dpi)
  const heightMm = parseAbsoluteLengthMm(attributes.height, 'height', dpi)
  if ((widthMm !== undefined && widthMm <= 0) || (heightMm !== undefined && heightMm <= 0)) {
    throw new AnalysisInputError('badSize', 'The drawing has a zero or negative width or height. Set a real document size in your drawing program.')
  }
  const pixelMm = mmPerPixel(dpi)
  if (!viewBox) return scaling(pixelMm, pixelMm)
  // A missing side follows the viewBox's aspect ratio; with neither, one user unit is one px.
  const aspect = viewBox.height / viewBox.width
  const viewportWidth = widthMm ?? (heightMm !== undefined ? heightMm / aspect : viewBox.width * pixelMm)
  const viewportHeight = heightMm ?? (widthMm !== undefined ? widthMm * aspect : viewBox.height * pixelMm)
  return viewBoxMatrix(viewBox, viewportWidth, viewportHeight, attributes.preserveAspectRatio)
}
