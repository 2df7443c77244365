import { AnalysisInputError } from './errors'
import { parseXmlTree, type XmlNode } from './xmlTree'

const DOCTYPE_PATTERN = /<!DOCTYPE/i
// An internal subset may declare entities; the parser leaves entity references
// unexpanded, but refusing them up front keeps entity-expansion and
// external-entity tricks out whatever the parser does in a later version.
const ENTITY_DECLARATION_PATTERN = /<!ENTITY/i
const SVG_ROOT_PATTERN = /<svg[\s>/]/
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
    root = parseXmlTree(text)
  } catch {
    throw new AnalysisInputError('malformedXml', 'This SVG file is damaged or incomplete (its XML could not be read). Save it again from your drawing program.')
  }
  if (Array.isArray(root) || root.name !== 'svg') {
    throw new AnalysisInputError('notSvg', 'This file is not a single SVG drawing. Upload one SVG file with one <svg> root.')
  }
  return root
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
