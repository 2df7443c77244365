import { parseOpacity } from './colour'
import { parseDeclarations, type StyleSheet } from './stylesheet'
import type { XmlNode } from './xmlTree'

/** The painting properties the engine needs, as computed for one element (SVG 1.1 §11, CSS cascade). */
export interface ComputedStyle {
  stroke: string
  fill: string
  color: string
  strokeWidth: string
  strokeOpacity: number
  fillOpacity: number
  /** Product of the element's and its ancestors' opacity (group opacity hides everything inside). */
  opacity: number
  visible: boolean
  fillRule: 'nonzero' | 'evenodd'
  displayNone: boolean
}

// SVG 1.1 property index: initial values.
export const INITIAL_STYLE: ComputedStyle = {
  stroke: 'none',
  fill: 'black',
  color: 'black',
  strokeWidth: '1',
  strokeOpacity: 1,
  fillOpacity: 1,
  opacity: 1,
  visible: true,
  fillRule: 'nonzero',
  displayNone: false,
}

const STYLE_PROPERTIES = new Set(['stroke', 'fill', 'color', 'stroke-width', 'stroke-opacity', 'fill-opacity', 'opacity', 'visibility', 'display', 'fill-rule'])

/**
 * Presentation attributes first, then the style sheet, then the inline style:
 * later wins (SVG 1.1 §6.4). Undefined when nothing applies, which is most
 * elements of a large drawing, so they cost no map.
 */
function collectDeclarations(node: XmlNode, styleSheet: StyleSheet): Map<string, string> | undefined {
  let declarations: Map<string, string> | undefined
  // An element has a few attributes and there are ten style properties: look through the attributes.
  for (const name in node.attributes) {
    const value = node.attributes[name]
    if (STYLE_PROPERTIES.has(name) && value !== undefined) (declarations ??= new Map()).set(name, value.trim())
  }
  if (!styleSheet.isEmpty) {
    for (const [property, value] of styleSheet.matching(node.name, node.attributes.class, node.attributes.id)) (declarations ??= new Map()).set(property, value)
  }
  if (node.attributes.style) {
    for (const [property, value] of parseDeclarations(node.attributes.style)) (declarations ??= new Map()).set(property, value)
  }
  return declarations
}

export function computeStyle(node: XmlNode, parent: ComputedStyle, styleSheet: StyleSheet): ComputedStyle {
  const declarations = collectDeclarations(node, styleSheet)
  if (!declarations) return parent
  const value = (property: string) => {
    const raw = declarations.get(property)
    return raw === undefined || raw === 'inherit' ? undefined : raw
  }
  const visibility = value('visibility')
  const fillRule = value('fill-rule')
  const strokeOpacity = value('stroke-opacity')
  const fillOpacity = value('fill-opacity')
  return {
    stroke: value('stroke') ?? parent.stroke,
    fill: value('fill') ?? parent.fill,
    color: value('color') ?? parent.color,
    strokeWidth: value('stroke-width') ?? parent.strokeWidth,
    strokeOpacity: strokeOpacity === undefined ? parent.strokeOpacity : parseOpacity(strokeOpacity),
    fillOpacity: fillOpacity === undefined ? parent.fillOpacity : parseOpacity(fillOpacity),
    opacity: parent.opacity * parseOpacity(value('opacity')),
    visible: visibility === undefined ? parent.visible : visibility === 'visible',
    fillRule: fillRule === undefined ? parent.fillRule : fillRule === 'evenodd' ? 'evenodd' : 'nonzero',
    displayNone: value('display') === 'none',
  }
}
