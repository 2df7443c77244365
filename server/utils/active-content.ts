import sax from 'sax'

// Scripts, event handlers, script links and embedded HTML have no place in a cut file; refusing them
// outright means no upload can ever run code, wherever its content is shown later. An SVG is judged by
// its parsed elements and attributes, so honest text such as a <title> reading "Flap on = fold" passes.

/** The patterns over the raw text: enough for a DXF, and the fallback when an SVG is not well-formed XML. */
const ACTIVE_TEXT: [RegExp, string][] = [
  // Element names may carry any namespace prefix (<v:script> in the SVG namespace is still a script).
  [/<(?:[\w.-]+:)?script[\s>/]/i, 'a script'],
  [/<(?:[\w.-]+:)?(?:foreignObject|iframe|embed|object)[\s>/]/i, 'embedded HTML (foreignObject)'],
  [/\son[a-z]+\s*=/i, 'an event handler (on… attribute)'],
  [/javascript\s*:|data:\s*text\/html|vbscript\s*:/i, 'a script link'],
  // Animation that rewrites a link can turn a harmless href into a script link after loading.
  [/<(?:[\w.-]+:)?(?:set|animate)\b[^>]*attributeName\s*=\s*["']?(?:[\w.-]+:)?href/i, 'an animated link'],
]

// Anything that could hide active content from ACTIVE_TEXT: character references, declared entities,
// and link schemes broken up by whitespace (browsers drop tabs and line breaks inside URLs).
const DISGUISE = /&#|<!DOCTYPE|<!ENTITY|s\s*c\s*r\s*i\s*p\s*t\s*:|d\s*a\s*t\s*a\s*:/i

const SCRIPT_ELEMENTS = new Set(['script', 'handler', 'listener'])
const EMBEDDING_ELEMENTS = new Set(['foreignobject', 'iframe', 'embed', 'object'])
const ANIMATION_ELEMENTS = /^(?:set|animate\w*)$/
// An HTML parser reading the drawing inline might take such text for markup.
const MARKUP_IN_TEXT = /<\s*(?:[\w.-]+:)?(?:script|foreignObject|iframe|embed|object)\b|<[a-z][^>]*\son[a-z]+\s*=/i

const localName = (name: string) => name.slice(name.indexOf(':') + 1).toLowerCase()
// What a browser makes of a URL: whitespace and control characters dropped, case ignored.
// eslint-disable-next-line no-control-regex -- control characters are what it drops
const asUrl = (value: string) => value.replace(/[\u0000-\u0020\u007f-\u009f]/g, '').toLowerCase()

function textFindings(text: string): string[] {
  return ACTIVE_TEXT.filter(([pattern]) => pattern.test(text)).map(([, what]) => what)
}

function parsedSvgFindings(svgText: string): string[] {
  const found = new Set<string>()
  const parser = sax.parser(true, { position: false })
  parser.ondoctype = (doctype) => {
    // Declared entities become markup or attribute text wherever they are used: judged as text, then known to the parser.
    for (const what of textFindings(doctype)) found.add(what)
    for (const [, name, , value] of doctype.matchAll(/<!ENTITY\s+([^\s%]+)\s+(["'])([^"'&<]*)\2\s*>/g)) parser.ENTITIES[name!] = value!
  }
  parser.onopentag = (tag) => {
    const element = localName(tag.name)
    if (SCRIPT_ELEMENTS.has(element)) found.add('a script')
    if (EMBEDDING_ELEMENTS.has(element)) found.add('embedded HTML (foreignObject)')
    for (const [name, value] of Object.entries(tag.attributes)) {
      const attribute = localName(name)
      if (attribute.startsWith('on')) found.add('an event handler (on… attribute)')
      const url = asUrl(value)
      if (url.includes('javascript:') || url.includes('vbscript:') || url.includes('data:text/html')) found.add('a script link')
      if (ANIMATION_ELEMENTS.test(element) && attribute === 'attributename' && localName(value.trim()) === 'href') found.add('an animated link')
    }
  }
  const checkText = (text: string) => {
    if (MARKUP_IN_TEXT.test(text)) found.add('markup hidden in its text')
  }
  parser.ontext = checkText
  parser.oncdata = checkText
  parser.oncomment = checkText
  parser.onerror = (error) => {
    throw error
  }
  parser.write(svgText).close()
  return [...found]
}

/** What active content the drawing holds, in words; empty when it holds none. */
export function activeContentIn(text: string, format: 'svg' | 'dxf'): string[] {
  const byText = textFindings(text)
  if (format === 'dxf') return byText
  // Most drawings hold nothing that even looks active: no parse needed.
  if (byText.length === 0 && !DISGUISE.test(text)) return []
  try {
    return parsedSvgFindings(text)
  } catch {
    // Not well-formed XML (a browser would not render it either): the text patterns decide.
    return byText
  }
}
