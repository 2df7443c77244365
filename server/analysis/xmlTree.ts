/**
 * The tree svgson 5.3.1 builds from SVG text, built the same way in one pass
 * over character codes. svgson wraps the text in <root>…</root> and runs the
 * character state machine of xml-lexer 0.2.2 (each character a function
 * call, each value grown a character at a time) feeding xml-reader 2.4.3;
 * this is that state machine and that reader, state for state and quirk for
 * quirk (no entity decoding, comments and <?…?> swallowed by their tag
 * names, a stray close tag fatal, …), with runs of characters that change
 * nothing skipped by indexOf and values taken as slices of the text. The
 * result is the same tree for every input, and the same failure where svgson
 * fails (tests/analysis/xmlTree.test.ts compares them on fixtures and on
 * random and mutated documents). About five times faster than svgson on the
 * benchmark patterns, and its values are flat strings, not ropes.
 */
export interface XmlNode {
  name: string
  type: 'element' | 'text'
  value: string
  /** Always null once read (xml-reader with parentNodes off). */
  parent: XmlNode | null
  attributes: Record<string, string>
  children: XmlNode[]
}

/** Thrown where svgson would throw; the caller turns it into the member's message. */
export class XmlTreeError extends Error {
  override name = 'XmlTreeError'
}

// xml-lexer's states.
const DATA = 0
const CDATA = 1
const TAG_BEGIN = 2
const TAG_NAME = 3
const TAG_END = 4
const ATTRIBUTE_NAME_START = 5
const ATTRIBUTE_NAME = 6
const ATTRIBUTE_NAME_END = 7
const ATTRIBUTE_VALUE_BEGIN = 8
const ATTRIBUTE_VALUE = 9

// The characters with actions of their own; every other character is a "char".
const GT = 62
const SLASH = 47
const EQUAL = 61
const DOUBLE_QUOTE = 34
const SINGLE_QUOTE = 39
const QUESTION = 63
const EXCLAMATION = 33
const CDATA_OPENING = '![CDATA['

const isSpace = (code: number) => code === 32 || code === 9 || code === 10 || code === 13
const isQuote = (code: number) => code === DOUBLE_QUOTE || code === SINGLE_QUOTE

function elementNode(name: string, parent: XmlNode | null): XmlNode {
  return { name, type: 'element', value: '', parent, attributes: {}, children: [] }
}

/**
 * svgson's parseSync: the one <svg> element of the text, an array when there
 * are several, or an XmlTreeError where svgson throws.
 */
export function parseXmlTree(input: string): XmlNode | XmlNode[] {
  return svgRoots(parseXmlElements(input))
}

/** The top-level nodes of the text, as svgson reads them before it looks for <svg>. */
export function parseXmlElements(input: string): XmlNode[] {
  return readTree(`<root>${input}</root>`).children
}

/** svgson's last step: the one <svg> element, an array when there are several, or an XmlTreeError. */
export function svgRoots(nodes: XmlNode[]): XmlNode | XmlNode[] {
  if (!(nodes.length > 0 && nodes.every((node) => node.name === 'svg'))) throw new XmlTreeError('nothing to parse')
  return nodes.length === 1 ? nodes[0]! : nodes
}

/** xml-lexer and xml-reader over the whole text; the reader's root once it closes. */
function readTree(text: string): XmlNode {
  const length = text.length
  // The reader.
  const rootNode = elementNode('', null)
  let current: XmlNode | null = null
  let readerAttributeName = ''
  let done = false
  // The lexer: `data` is text.slice(dataStart, …), the names and values are slices too.
  let state = DATA
  let dataStart = 0
  let tagName = ''
  let tagStart = 0
  let attributeName = ''
  let attributeStart = 0
  let valueStart = 0
  let openingQuote = 0
  let isClosing = false

  const currentElement = (): XmlNode => {
    if (current === null) throw new XmlTreeError('no open element')
    return current
  }
  // xml-lexer emits nothing while the tag name starts with ? or ! (declarations, comments, DOCTYPE).
  const muted = () => tagName.length > 0 && (tagName.charCodeAt(0) === QUESTION || tagName.charCodeAt(0) === EXCLAMATION)
  const openTag = (name: string) => {
    if (muted()) return
    if (current === null) {
      current = rootNode
      current.name = name
    } else {
      const node = elementNode(name, current)
      current.children.push(node)
      current = node
    }
  }
  const closeTag = (name: string) => {
    if (muted()) return
    const node = currentElement()
    const parent = node.parent
    node.parent = null
    // An unexpected closing tag is ignored (after the parent link is dropped, as xml-reader does).
    if (node.name !== name) return
    if (node === rootNode) {
      done = true
      return
    }
    current = parent
  }
  const textNode = (value: string) => {
    if (muted() || current === null) return
    current.children.push({ name: '', type: 'text', value, parent: null, attributes: {}, children: [] })
  }
  const attributeNameEvent = (name: string) => {
    if (muted()) return
    readerAttributeName = name
    currentElement().attributes[name] = ''
  }
  const attributeValueEvent = (value: string) => {
    if (muted()) return
    currentElement().attributes[readerAttributeName] = value
  }
  const toData = (at: number) => {
    dataStart = at + 1
    state = DATA
  }

  let index = 0
  while (index < length && !done) {
    const code = text.charCodeAt(index)
    switch (state) {
      case DATA: {
        const lt = text.indexOf('<', index)
        if (lt < 0) {
          index = length
          continue
        }
        const data = text.slice(dataStart, lt)
        if (data.trim()) textNode(data)
        tagName = ''
        isClosing = false
        state = TAG_BEGIN
        index = lt + 1
        continue
      }
      case CDATA: {
        const end = text.indexOf(']]>', dataStart)
        if (end < 0) {
          index = length
          continue
        }
        textNode(text.slice(dataStart, end))
        index = end + 3
        dataStart = index
        state = DATA
        continue
      }
      case TAG_BEGIN:
        if (code === SLASH) {
          tagName = ''
          isClosing = true
        } else if (!isSpace(code)) {
          tagStart = index
          state = TAG_NAME
        }
        break
      case TAG_NAME: {
        // The name runs to a space, > or /, unless it turns out to open a CDATA section.
        let end = index
        while (end < length) {
          const next = text.charCodeAt(end)
          if (isSpace(next) || next === GT || next === SLASH) break
          if (end - tagStart + 1 === CDATA_OPENING.length && text.startsWith(CDATA_OPENING, tagStart)) break
          end++
        }
        if (end < length && end - tagStart + 1 === CDATA_OPENING.length && text.startsWith(CDATA_OPENING, tagStart)) {
          state = CDATA
          dataStart = end + 1
          tagName = ''
          index = end + 1
          continue
        }
        tagName = text.slice(tagStart, end)
        if (end === length) {
          index = length
          continue
        }
        const ending = text.charCodeAt(end)
        if (isSpace(ending)) {
          if (isClosing) state = TAG_END
          else {
            state = ATTRIBUTE_NAME_START
            openTag(tagName)
          }
        } else if (ending === GT) {
          if (isClosing) closeTag(tagName)
          else openTag(tagName)
          toData(end)
        } else {
          state = TAG_END
          openTag(tagName)
        }
        index = end + 1
        continue
      }
      case TAG_END: {
        const gt = text.indexOf('>', index)
        if (gt < 0) {
          index = length
          continue
        }
        closeTag(tagName)
        toData(gt)
        index = gt + 1
        continue
      }
      case ATTRIBUTE_NAME_START:
        if (code === GT) toData(index)
        else if (code === SLASH) {
          isClosing = true
          state = TAG_END
        } else if (!isSpace(code)) {
          attributeStart = index
          state = ATTRIBUTE_NAME
        }
        break
      case ATTRIBUTE_NAME: {
        let end = index
        while (end < length) {
          const next = text.charCodeAt(end)
          if (isSpace(next) || next === EQUAL || next === GT || next === SLASH) break
          end++
        }
        attributeName = text.slice(attributeStart, end)
        if (end === length) {
          index = length
          continue
        }
        const ending = text.charCodeAt(end)
        if (isSpace(ending)) state = ATTRIBUTE_NAME_END
        else if (ending === EQUAL) {
          attributeNameEvent(attributeName)
          state = ATTRIBUTE_VALUE_BEGIN
        } else if (ending === GT) {
          attributeNameEvent(attributeName)
          attributeValueEvent('')
          toData(end)
        } else {
          isClosing = true
          attributeNameEvent(attributeName)
          attributeValueEvent('')
          state = TAG_END
        }
        index = end + 1
        continue
      }
      case ATTRIBUTE_NAME_END:
        if (code === EQUAL) {
          attributeNameEvent(attributeName)
          state = ATTRIBUTE_VALUE_BEGIN
        } else if (code === GT) {
          attributeNameEvent(attributeName)
          attributeValueEvent('')
          toData(index)
        } else if (!isSpace(code)) {
          // Any other character (a slash too) starts the next attribute; this one had no value.
          attributeNameEvent(attributeName)
          attributeValueEvent('')
          attributeStart = index
          state = ATTRIBUTE_NAME
        }
        break
      case ATTRIBUTE_VALUE_BEGIN:
        if (isQuote(code)) {
          openingQuote = code
          valueStart = index + 1
          state = ATTRIBUTE_VALUE
        } else if (code === GT) {
          attributeValueEvent('')
          toData(index)
        } else if (!isSpace(code)) {
          openingQuote = 0
          valueStart = index
          state = ATTRIBUTE_VALUE
        }
        break
      case ATTRIBUTE_VALUE: {
        if (openingQuote !== 0) {
          // Inside quotes only the opening quote character ends the value.
          const end = text.indexOf(openingQuote === DOUBLE_QUOTE ? '"' : "'", index)
          if (end < 0) {
            index = length
            continue
          }
          attributeValueEvent(text.slice(valueStart, end))
          state = ATTRIBUTE_NAME_START
          index = end + 1
          continue
        }
        if (isSpace(code)) {
          attributeValueEvent(text.slice(valueStart, index))
          state = ATTRIBUTE_NAME_START
        } else if (code === GT) {
          attributeValueEvent(text.slice(valueStart, index))
          toData(index)
        } else if (code === SLASH) {
          attributeValueEvent(text.slice(valueStart, index))
          isClosing = true
          state = TAG_END
        }
        break
      }
    }
    index++
  }
  if (!done) throw new XmlTreeError('the document does not end')
  return rootNode
}
