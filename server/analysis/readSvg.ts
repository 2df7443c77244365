import { parseColour, toHex } from './colour'
import { ColourMapper } from './colourMapping'
import { AnalysisInputError } from './errors'
import type { FindingCollector, SiteList } from './findings'
import { applyX, applyY, type Matrix, multiply, parseTransform, translation } from './matrix'
import { NUMBER_GRAMMAR } from './numbers'
import type { AnalysisParams } from './params'
import type { DrawnOperation } from './polylines'
import { shapeToPathData } from './shapes'
import { type ComputedStyle, computeStyle, INITIAL_STYLE } from './style'
import { StyleSheet } from './stylesheet'
import { parseUserLength } from './units'
import { parseViewBox, rootMatrix, rootViewportSize, viewBoxMatrix, type ViewportSize } from './viewport'
import type { XmlNode } from './xmlTree'

/** A visible shape to flatten: its path data in user units and the matrix into mm. */
export interface DrawnElement {
  pathData: string
  matrix: Matrix
  operation: DrawnOperation
  /** Filled shapes are engrave areas; their subpaths close implicitly. */
  filled: boolean
  fillRule: 'nonzero' | 'evenodd'
}

export interface ReadDrawing {
  elements: DrawnElement[]
}

// Common practice, no source: no drawing program nests groups this deep; deeper files are machine-made or hostile.
const MAX_NESTING_DEPTH = 400
// Bounds what <use> chains can multiply (each reference may repeat a whole subtree).
const MAX_USE_DEPTH = 32
const MAX_RENDERED_ELEMENTS = 2_000_000

const NOT_RENDERED = new Set(['defs', 'clipPath', 'mask', 'symbol', 'marker', 'pattern', 'linearGradient', 'radialGradient', 'filter', 'style', 'title', 'desc', 'metadata', 'script', 'foreignObject'])
const CONTAINERS = new Set(['g', 'a'])
const SHAPES = new Set(['path', 'rect', 'circle', 'ellipse', 'line', 'polyline', 'polygon'])

interface Pending {
  node: XmlNode
  parentMatrix: Matrix
  parentStyle: ComputedStyle
  useDepth: number
  /** The nearest viewport, which percentages refer to. */
  viewport: ViewportSize
  /** For an <svg> a <use> refers to: the use's width and height, which take the place of the svg's own. */
  sizeFromUse?: { width?: string; height?: string }
}

/**
 * Walks the SVG tree without recursion and lists what a renderer would
 * paint, with each stroke's operation from the colour mapping. Text and
 * raster images become findings (a site each), as do stroke colours the
 * mapping lacks (a group per colour, its site at the first such line).
 */
export function readSvgDocument(root: XmlNode, params: AnalysisParams, findings: FindingCollector): ReadDrawing {
  const { byId, styleSheet } = indexDocument(root)
  const mapper = new ColourMapper(params.colourMapping)
  const elements: DrawnElement[] = []
  const unmappedColours = new Map<string, SiteList>()
  // Thousands of shapes share a handful of colours: each colour text is parsed once.
  const paints = new Map<string, Paint>()
  const stack: Pending[] = []
  const pushChildren = (node: XmlNode, matrix: Matrix, style: ComputedStyle, useDepth: number, viewport: ViewportSize) => {
    for (let index = node.children.length - 1; index >= 0; index--) {
      stack.push({ node: node.children[index]!, parentMatrix: matrix, parentStyle: style, useDepth, viewport })
    }
  }
  const rootStyle = computeStyle(root, INITIAL_STYLE, styleSheet)
  // SVG 1.1 §11.5: display none on an element, the root included, renders neither it nor anything in it.
  if (rootStyle.displayNone) return { elements }
  pushChildren(
    root,
    multiply(rootMatrix(root.attributes, params.dpi), parseTransform(root.attributes.transform)),
    rootStyle,
    0,
    rootViewportSize(root.attributes, params.dpi),
  )
  let rendered = 0

  while (stack.length > 0) {
    const { node, parentMatrix, parentStyle, useDepth, viewport, sizeFromUse } = stack.pop()!
    if (node.type !== 'element' || NOT_RENDERED.has(node.name)) continue
    if (++rendered > MAX_RENDERED_ELEMENTS) {
      throw new AnalysisInputError('tooComplex', 'This drawing repeats shapes too often to analyse (its <use> references multiply into millions of shapes).')
    }
    const style = computeStyle(node, parentStyle, styleSheet)
    if (style.displayNone) continue
    // Most elements carry no transform; they share their parent's matrix instead of multiplying by the identity.
    const matrix = node.attributes.transform ? multiply(parentMatrix, parseTransform(node.attributes.transform)) : parentMatrix

    if (node.name === 'svg') {
      const nested = nestedViewport(node, viewport, sizeFromUse)
      if (nested) pushChildren(node, multiply(matrix, nested.matrix), style, useDepth, nested.size)
    } else if (node.name === 'switch') {
      const chosen = chosenChild(node)
      if (chosen) stack.push({ node: chosen, parentMatrix: matrix, parentStyle: style, useDepth, viewport })
    } else if (CONTAINERS.has(node.name)) {
      pushChildren(node, matrix, style, useDepth, viewport)
    } else if (node.name === 'use') {
      if (useDepth >= MAX_USE_DEPTH) {
        throw new AnalysisInputError('tooComplex', 'This drawing has <use> references nested too deep (or referring to themselves).')
      }
      expandUse(node, matrix, style, useDepth, viewport, byId, styleSheet, stack)
    } else if (!style.visible) {
      continue
    } else if (SHAPES.has(node.name)) {
      const pathData = shapeToPathData(node, viewport)
      if (pathData) paintShape(pathData, matrix, style)
    } else if (node.name === 'text') {
      addElementSite(findings.group({ code: 'text-not-outlined', severity: 'warning', facts: { format: 'svg' } }), node, matrix)
    } else if (node.name === 'image') {
      addElementSite(findings.group({ code: 'raster-image', severity: 'warning', facts: { format: 'svg' } }), node, matrix)
    }
  }
  return { elements }

  function resolvePaint(value: string, style: ComputedStyle): Paint {
    if (value === 'none') return NO_PAINT
    const colourText = value.toLowerCase() === 'currentcolor' ? style.color : value
    let paint = paints.get(colourText)
    if (!paint) {
      paint = paintOfColour(colourText)
      paints.set(colourText, paint)
    }
    return paint
  }

  function paintShape(pathData: string, matrix: Matrix, style: ComputedStyle): void {
    const stroke = resolvePaint(style.stroke, style)
    const strokeVisible = stroke.kind !== 'none' && stroke.alpha * style.strokeOpacity * style.opacity > 0 && Number.parseFloat(style.strokeWidth) !== 0
    const fill = resolvePaint(style.fill, style)
    const fillVisible = fill.kind !== 'none' && fill.alpha * style.fillOpacity * style.opacity > 0
    if (strokeVisible) {
      const operation = stroke.kind === 'colour' ? mapper.operationFor(stroke.colour, stroke.hex) : undefined
      if (operation === undefined) reportUnmappedColour(stroke.label, pathData, matrix)
      const effective = operation ?? params.unmappedStrokeOperation
      if (effective === 'engrave' && fillVisible) elements.push({ pathData, matrix, operation: 'engrave', filled: true, fillRule: style.fillRule })
      else if (effective !== 'ignore') elements.push({ pathData, matrix, operation: strokeOperation(effective), filled: false, fillRule: style.fillRule })
      return
    }
    if (!fillVisible) return
    if (fill.kind === 'colour' && mapper.operationFor(fill.colour, fill.hex) === 'ignore') return
    elements.push({ pathData, matrix, operation: 'engrave', filled: true, fillRule: style.fillRule })
  }

  function reportUnmappedColour(label: string, pathData: string, matrix: Matrix): void {
    let sites = unmappedColours.get(label)
    if (sites === undefined) {
      sites = findings.group({ code: 'unmapped-colour', severity: 'warning', cause: label, facts: { format: 'svg', colour: label, countedAs: params.unmappedStrokeOperation } })
      unmappedColours.set(label, sites)
      const [x, y] = firstCoordinates(pathData)
      sites.add(applyX(matrix, x, y), applyY(matrix, x, y))
    }
    sites.addToFact('lines', 1)
  }
}

/**
 * What a stroke (a line, not an area) of this operation becomes. Engraving an area needs an area: a fill, or a
 * stroke in the engrave colour on a filled shape. A stroke in the engrave colour alone, closed or open, is marked
 * along its line like a score line (its length at the score speed), never billed as the area it happens to enclose.
 */
export function strokeOperation(operation: DrawnOperation): DrawnOperation {
  return operation === 'engrave' ? 'score' : operation
}

type Paint = { kind: 'none' } | { kind: 'colour'; colour: NonNullable<ReturnType<typeof parseColour>>; hex: string; label: string; alpha: number } | { kind: 'other'; label: string; alpha: number }

const NO_PAINT: Paint = { kind: 'none' }

function paintOfColour(colourText: string): Paint {
  const colour = parseColour(colourText)
  if (!colour) return { kind: 'other', label: colourText.slice(0, 40), alpha: 1 }
  if (colour.a === 0) return NO_PAINT
  const hex = toHex(colour)
  return { kind: 'colour', colour, hex, label: hex, alpha: colour.a }
}

function expandUse(
  node: XmlNode,
  matrix: Matrix,
  style: ComputedStyle,
  useDepth: number,
  viewport: ViewportSize,
  byId: IdIndex,
  styleSheet: StyleSheet,
  stack: Pending[],
): void {
  const reference = node.attributes.href ?? node.attributes['xlink:href']
  const target = reference?.startsWith('#') ? byId.get(reference.slice(1)) : undefined
  if (!target) return
  const offset = translation(parseUserLength(node.attributes.x, 'x', viewport.width, 0), parseUserLength(node.attributes.y, 'y', viewport.height, 0))
  // SVG 1.1 §5.6: x/y translate after the use element's own transform, before the target's.
  if (target.name !== 'symbol') {
    // SVG 2 §5.6: a use's width and height (other than auto) replace those of an <svg> it refers to.
    const sizeFromUse = target.name === 'svg' ? { width: givenSize(node.attributes.width), height: givenSize(node.attributes.height) } : undefined
    stack.push({ node: target, parentMatrix: multiply(matrix, offset), parentStyle: style, useDepth: useDepth + 1, viewport, sizeFromUse })
    return
  }
  // A symbol behaves as a nested viewport sized by the use element.
  const symbolStyle = computeStyle(target, style, styleSheet)
  if (symbolStyle.displayNone) return
  const symbolMatrix = multiply(matrix, multiply(offset, symbolViewportMatrix(target, node, viewport)))
  for (let index = target.children.length - 1; index >= 0; index--) {
    stack.push({
      node: target.children[index]!,
      parentMatrix: symbolMatrix,
      parentStyle: symbolStyle,
      useDepth: useDepth + 1,
      viewport: symbolViewport(target, node, viewport),
    })
  }
}

function symbolViewportMatrix(symbol: XmlNode, use: XmlNode, viewport: ViewportSize): Matrix {
  const viewBox = parseViewBox(symbol.attributes.viewBox)
  if (!viewBox) return translation(0, 0)
  const width = parseUserLength(use.attributes.width ?? symbol.attributes.width, 'width', viewport.width, viewBox.width)
  const height = parseUserLength(use.attributes.height ?? symbol.attributes.height, 'height', viewport.height, viewBox.height)
  return viewBoxMatrix(viewBox, width, height, symbol.attributes.preserveAspectRatio)
}

/** What percentages inside a symbol refer to: its viewBox, else the viewport the use is in. */
function symbolViewport(symbol: XmlNode, use: XmlNode, viewport: ViewportSize): ViewportSize {
  const viewBox = parseViewBox(symbol.attributes.viewBox)
  return viewBox ? { width: viewBox.width, height: viewBox.height } : viewport
}

/** A width or height attribute that sets a size: absent and SVG 2's "auto" leave it to the element. */
function givenSize(value: string | undefined): string | undefined {
  return value === undefined || value.trim() === 'auto' ? undefined : value
}

/**
 * A nested <svg> (SVG 2 §8.2, SVG 1.1 §7.9): a new viewport at x, y of the
 * parent's user space, its width and height 100 % of the parent viewport
 * unless given (a <use> that refers to it gives its own); a viewBox fills it
 * by preserveAspectRatio. The viewport size is in the parent's user units;
 * its viewBox (or, without one, that size) is what percentages inside refer
 * to. Undefined when a zero width or height disables rendering.
 */
function nestedViewport(node: XmlNode, parent: ViewportSize, sizeFromUse: Pending['sizeFromUse']): { matrix: Matrix; size: ViewportSize } | undefined {
  const { attributes } = node
  const offset = translation(parseUserLength(attributes.x, 'x', parent.width, 0), parseUserLength(attributes.y, 'y', parent.height, 0))
  const viewBox = parseViewBox(attributes.viewBox)
  // A side nothing gives a size to (a percentage of an unknown viewport) takes the viewBox's.
  const side = (
    fromUse: string | undefined,
    own: string | undefined,
    name: string,
    percentOf: number | undefined,
    viewBoxSide: number | undefined,
  ): number | undefined => {
    const size = parseUserLength(fromUse ?? givenSize(own) ?? '100%', name, percentOf, Number.NaN)
    return Number.isNaN(size) ? viewBoxSide : nonNegativeSize(size, name)
  }
  const width = side(sizeFromUse?.width, attributes.width, 'width', parent.width, viewBox?.width)
  const height = side(sizeFromUse?.height, attributes.height, 'height', parent.height, viewBox?.height)
  if (width === 0 || height === 0) return undefined
  if (!viewBox) return { matrix: offset, size: { width, height } }
  return {
    matrix: multiply(offset, viewBoxMatrix(viewBox, width ?? viewBox.width, height ?? viewBox.height, attributes.preserveAspectRatio)),
    size: { width: viewBox.width, height: viewBox.height },
  }
}

function nonNegativeSize(value: number, name: string): number {
  if (value < 0) throw new AnalysisInputError('badSize', `A nested drawing has a negative ${name} (${value}); fix it in your drawing program.`)
  return value
}

// The language the conditions of a <switch> are tested against: the server has no reader's language, so English
// (common practice, no source: drawing programs write their default text in English).
const READER_LANGUAGE = 'en'

/**
 * The one child a <switch> renders (SVG 1.1 §5.8.2, SVG 2 §5.8): the first
 * direct child element whose conditions pass, skipping what is never
 * rendered (title, desc, metadata…). Kerfbook supports no extension, so any
 * requiredExtensions fails (an empty one too); requiredFeatures no longer
 * counts (SVG 2 dropped it); systemLanguage passes when one of its tags is
 * the reader's language or that language with a region (en, en-GB).
 */
function chosenChild(node: XmlNode): XmlNode | undefined {
  return node.children.find((child) => child.type === 'element' && (!NOT_RENDERED.has(child.name) || child.name === 'foreignObject') && conditionsPass(child.attributes))
}

function conditionsPass(attributes: Record<string, string>): boolean {
  if (attributes.requiredExtensions !== undefined) return false
  const languages = attributes.systemLanguage
  if (languages === undefined) return true
  return languages.split(',').some((tag) => {
    const language = tag.trim().toLowerCase()
    return language === READER_LANGUAGE || language.startsWith(`${READER_LANGUAGE}-`)
  })
}

function addElementSite(sites: SiteList, node: XmlNode, matrix: Matrix): void {
  const x = firstNumberOf(node.attributes.x)
  const y = firstNumberOf(node.attributes.y)
  sites.add(applyX(matrix, x, y), applyY(matrix, x, y))
}

function firstNumberOf(value: string | undefined): number {
  const number = Number.parseFloat(value ?? '')
  return Number.isFinite(number) ? number : 0
}

const NUMBERS_ANYWHERE = new RegExp(NUMBER_GRAMMAR, 'g')

function firstCoordinates(pathData: string): [number, number] {
  const numbers = pathData.match(NUMBERS_ANYWHERE) ?? []
  return [firstNumberOf(numbers[0]), firstNumberOf(numbers[1])]
}

/**
 * One pass over the whole tree (with an explicit stack, so depth costs no
 * call stack): refuses absurd nesting, notes the elements with an id for
 * <use>, and collects <style> sheets, which apply wherever they appear. The
 * ids are only put in a map when a <use> first asks: hashing every id of a
 * large drawing costs more than the rest of the pass.
 */
function indexDocument(root: XmlNode): { byId: IdIndex; styleSheet: StyleSheet } {
  const withId: XmlNode[] = []
  const styleSheet = new StyleSheet()
  const nodes: XmlNode[] = [root]
  const depths: number[] = [0]
  while (nodes.length > 0) {
    const node = nodes.pop()!
    const depth = depths.pop()!
    if (depth > MAX_NESTING_DEPTH) {
      throw new AnalysisInputError('tooComplex', `This drawing nests groups more than ${MAX_NESTING_DEPTH} levels deep, which Kerfbook does not analyse. Flatten or ungroup it in your drawing program.`)
    }
    if (node.attributes?.id) withId.push(node)
    if (node.name === 'style') styleSheet.add(node.children.map((child) => child.value).join(''))
    // Children go on the stack last first, so the walk (and `withId`, and the style sheets) follow document order.
    const children = node.children ?? []
    for (let index = children.length - 1; index >= 0; index--) {
      if (children[index]!.type !== 'element') continue
      nodes.push(children[index]!)
      depths.push(depth + 1)
    }
  }
  return { byId: new IdIndex(withId), styleSheet }
}

/** Elements by id (given in document order), the first of equal ids winning, as getElementById does; the map is built on the first lookup. */
class IdIndex {
  private map: Map<string, XmlNode> | undefined

  constructor(private readonly withId: XmlNode[]) {}

  get(id: string): XmlNode | undefined {
    if (this.map === undefined) {
      this.map = new Map()
      for (const node of this.withId) if (!this.map.has(node.attributes.id!)) this.map.set(node.attributes.id!, node)
    }
    return this.map.get(id)
  }
}
