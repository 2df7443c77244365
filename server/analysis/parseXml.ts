import { AnalysisInputError } from './errors'
import { parseXmlElements, svgRoots, type XmlNode } from './xmlTree'

const DOCTYPE_PATTERN = /<!DOCTYPE/i
// An internal subset may declare entities; the parser leaves entity references
// unexpanded, but refusing them up front keeps entity-expansion and
// external-entity tricks out whatever the parser does in a later version.
const ENTITY_DECLARATION_PATTERN = /<!ENTITY/i
// The root may carry a namespace prefix (<svg:svg xmlns:svg="http://www.w3.org/2000/svg">).
const SVG_ROOT_PATTERN = /<(?:[A-Za-z_][\w.-]*:)?svg[\s>/]/
const SVG_NAMESPACE = 'http://www.w3.org/2000/svg'
// A binary DXF starts with this sentinel (DXF reference, "Binary DXF Files"); its groups are not text.
const BINARY_DXF_PATTERN = /^\uFEFF?AutoCAD Binary DXF/
const COMMENT_PATTERN = /<!--[\s\S]*?-->/g
// Far more attributes in one tag than any drawing program writes: a parser stress test, not a drawing.
const MAX_ATTRIBUTES_PER_TAG = 2000
// A tag needs at least this many characters to hold that many attributes (a="").
const MIN_CHARACTERS_OF_CROWDED_TAG = MAX_ATTRIBUTES_PER_TAG * 4

/**
 * Parses SVG text into the tree svgson would give (`xmlTree.ts`). The reader
 * is iterative, so deep nesting costs time in proportion to the file, not stack.
 */
export function parseSvgXml(svgText: string): XmlNode {
  if (typeof svgText === 'string' && BINARY_DXF_PATTERN.test(svgText)) {
    // No well-known npm package reads binary DXF; every CAD program that writes it also writes ASCII DXF.
    throw new AnalysisInputError('notSvg', 'This is a binary DXF file, which Kerfbook does not read. Save it again as ASCII DXF (or SVG) in your CAD program and upload that.')
  }
  if (typeof svgText !== 'string' || !SVG_ROOT_PATTERN.test(svgText)) {
    throw new AnalysisInputError('notSvg', 'This file is not an SVG drawing. Export the pattern as SVG and upload it again.')
  }
  if (ENTITY_DECLARATION_PATTERN.test(svgText)) {
    throw new AnalysisInputError('unsafeXml', 'This SVG declares XML entities, which Kerfbook does not accept for safety. Save it again from your drawing program without a DOCTYPE.')
  }
  // Comments carry nothing to cut; dropping them first keeps a comment-stuffed file from costing the parser seconds.
  const withoutDoctype = stripDoctype(svgText)
  const text = withoutDoctype.includes('<!--') ? withoutDoctype.replace(COMMENT_PATTERN, '') : withoutDoctype
  assertReasonableTags(text)
  let root: XmlNode | XmlNode[]
  try {
    const nodes = parseXmlElements(text)
    for (const node of nodes) readAsSvg(node)
    root = svgRoots(nodes)
  } catch {
    throw new AnalysisInputError('malformedXml', 'This SVG file is damaged or incomplete (its XML could not be read). Save it again from your drawing program.')
  }
  if (Array.isArray(root) || root.name !== 'svg') {
    throw new AnalysisInputError('notSvg', 'This file is not a single SVG drawing. Upload one SVG file with one <svg> root.')
  }
  return root
}

/**
 * What an XML processor does that the svgson-compatible tree leaves undone,
 * in one walk: elements in the SVG namespace under a prefix lose the prefix
 * (Namespaces in XML 1.0: the prefix is bound by an xmlns:prefix attribute on
 * the element or an ancestor), and character and predefined entity
 * references in attribute values are replaced (XML 1.0 §4.1, §4.6:
 * d="M10 10&#10;L90 10" holds a line feed).
 */
function readAsSvg(root: XmlNode): void {
  const stack: Array<{ node: XmlNode; svgPrefixes: ReadonlySet<string> }> = [{ node: root, svgPrefixes: new Set() }]
  while (stack.length > 0) {
    const { node, svgPrefixes: inherited } = stack.pop()!
    if (node.type !== 'element') continue
    let svgPrefixes = inherited
    for (const name in node.attributes) {
      const value = node.attributes[name]!
      if (value.includes('&')) node.attributes[name] = withReferencesReplaced(value)
      if (name.startsWith('xmlns:')) {
        const prefix = name.slice('xmlns:'.length)
        const isSvg = node.attributes[name] === SVG_NAMESPACE
        if (isSvg !== svgPrefixes.has(prefix)) {
          const changed = new Set(svgPrefixes)
          if (isSvg) changed.add(prefix)
          else changed.delete(prefix)
          svgPrefixes = changed
        }
      }
    }
    const colon = node.name.indexOf(':')
    if (colon > 0 && svgPrefixes.has(node.name.slice(0, colon))) node.name = node.name.slice(colon + 1)
    for (const child of node.children) stack.push({ node: child, svgPrefixes })
  }
}

const PREDEFINED_ENTITIES: Readonly<Record<string, string>> = { lt: '<', gt: '>', amp: '&', quot: '"', apos: "'" }
const REFERENCE_PATTERN = /&(?:#x([0-9a-fA-F]+)|#([0-9]+)|(lt|gt|amp|quot|apos));/g

/** Character references and the five predefined entities replaced; anything else (an undeclared entity) is left as written. */
function withReferencesReplaced(value: string): string {
  return value.replace(REFERENCE_PATTERN, (reference: string, hex?: string, decimal?: string, entity?: string): string => {
    if (entity) return PREDEFINED_ENTITIES[entity] ?? reference
    const codePoint = hex ? Number.parseInt(hex, 16) : Number.parseInt(decimal ?? '', 10)
    return codePoint > 0 && codePoint <= 0x10ffff ? String.fromCodePoint(codePoint) : reference
  })
}

/** A plain DOCTYPE without an internal subset carries nothing we use. */
function stripDoctype(svgText: string): string {
  const match = DOCTYPE_PATTERN.exec(svgText)
  if (!match) return svgText
  const end = svgText.indexOf('>', match.index)
  if (end < 0) return svgText
  return svgText.slice(0, match.index) + svgText.slice(end + 1)
}

/** Looks at tags long enough to be crowded only; the hops from < to > keep the pass linear and allocate nothing for ordinary tags. */
function assertReasonableTags(text: string): void {
  let open = text.indexOf('<')
  while (open >= 0) {
    const close = text.indexOf('>', open)
    if (close < 0) return
    if (close - open > MIN_CHARACTERS_OF_CROWDED_TAG && (text.slice(open, close).match(/=/g)?.length ?? 0) > MAX_ATTRIBUTES_PER_TAG) {
      throw new AnalysisInputError('tooComplex', `One element of this SVG has more than ${MAX_ATTRIBUTES_PER_TAG} attributes, which no drawing needs. Save it again from your drawing program.`)
    }
    open = text.indexOf('<', close)
  }
}
