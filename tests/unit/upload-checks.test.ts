// The active-content check judges an SVG by its parsed elements and attributes, and file names are
// normalised and bounded for display.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { activeContentIn } from '../../server/utils/active-content'
import { displayFileName, MAX_FILE_NAME_CHARS } from '../../server/utils/file-name'

const svgOf = (body: string, rootAttributes = '') =>
  `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="50mm" height="50mm" viewBox="0 0 50 50"${rootAttributes}>${body}<rect x="5" y="5" width="40" height="40" fill="none" stroke="#ff6a00"/></svg>`
const corpus = (name: string) => readFileSync(new URL(`../fixtures/hostile/${name}`, import.meta.url), 'utf8')

describe('active content in an SVG', () => {
  it.each([
    ['a title with "on… =" text', svgOf('<title>Flap on = fold, onset= 3 mm</title>')],
    ['a description mentioning javascript: and on…= as prose', svgOf('<desc>No javascript: here; a &lt; b onset= 2 is just text</desc>')],
    ['text with character references', svgOf('<text x="1" y="1">Lid &#x2014; 3&#160;mm</text>')],
    ['an editor’s DOCTYPE with entities for its namespaces', `<?xml version="1.0"?>\n<!DOCTYPE svg PUBLIC "-//W3C//DTD SVG 1.1//EN" "http://www.w3.org/Graphics/SVG/1.1/DTD/svg11.dtd" [\n<!ENTITY ns_svg "http://www.w3.org/2000/svg">\n]>\n<svg xmlns="&ns_svg;" width="50mm" height="50mm"><title>Box onset= lid</title><rect width="4" height="4"/></svg>`],
    ['an ordinary link', svgOf('<a href="https://example.org/data:thing"><circle r="2"/></a>')],
  ])('accepts %s', (_, svg) => {
    expect(activeContentIn(svg, 'svg')).toEqual([])
  })

  it.each([
    ['an onload handler (corpus)', corpus('onload-handler.svg'), 'event handler'],
    ['an onmouseover handler (corpus)', corpus('onmouseover-handler.svg'), 'event handler'],
    ['a script element (corpus)', corpus('script-element.svg'), 'a script'],
    ['a script in CDATA (corpus)', corpus('script-cdata.svg'), 'a script'],
    ['a namespaced script (corpus)', corpus('namespaced-script.svg'), 'a script'],
    ['a foreignObject (corpus)', corpus('foreign-object.svg'), 'foreignObject'],
    ['a javascript: link (corpus)', corpus('javascript-href.svg'), 'script link'],
    ['an xlink javascript: link with spaces and capitals (corpus)', corpus('xlink-javascript-href.svg'), 'script link'],
    ['a data:text/html link (corpus)', corpus('data-html-href.svg'), 'script link'],
    ['an animated link (corpus)', corpus('animated-javascript-href.svg'), 'script link'],
    ['an upper-case handler', svgOf('<rect ONCLICK="alert(1)"/>'), 'event handler'],
    ['a handler after a line break', svgOf('<rect\nonclick\n=\n"alert(1)"/>'), 'event handler'],
    ['a link hidden by character references', svgOf('<a href="&#106;avascript:alert(1)"><circle r="1"/></a>'), 'script link'],
    ['a link broken by a tab', svgOf('<a href="java&#x09;script:alert(1)"><circle r="1"/></a>'), 'script link'],
    ['a link broken by a line break', svgOf('<a href="javas\ncript:alert(1)"><circle r="1"/></a>'), 'script link'],
    ['a link from a declared entity', `<!DOCTYPE svg [<!ENTITY go "javascript:alert(1)">]>${svgOf('<a href="&go;"><circle r="1"/></a>')}`, 'script link'],
    ['a script from a declared entity', `<!DOCTYPE svg [<!ENTITY s "<script>alert(1)</script>">]>${svgOf('<g>&s;</g>')}`, 'a script'],
    ['an animation that rewrites xlink:href', svgOf('<a><animate attributeName="xlink:href" values="#a;#b"/></a>'), 'animated link'],
    ['markup with a handler hidden in a title', svgOf('<title>&lt;img src=x onerror=alert(1)&gt;</title>'), 'markup hidden'],
    ['markup hidden in a comment', svgOf('<!-- <img src=x onerror=alert(1)> -->'), 'markup hidden'],
    ['an iframe', svgOf('<iframe src="https://example.org"/>'), 'embedded HTML'],
  ])('refuses %s', (_, svg, what) => {
    expect(activeContentIn(svg, 'svg').join(' | ')).toContain(what)
  })

  it('falls back to the text patterns for a file that is not well-formed XML', () => {
    expect(activeContentIn('<svg><rect onclick="alert(1)"><g></svg>', 'svg')).toContain('an event handler (on… attribute)')
    expect(activeContentIn('<svg><title>Flap onset= 3 mm</title><g></svg>', 'svg')).toEqual(['an event handler (on… attribute)'])
  })

  it('keeps the text patterns for a DXF', () => {
    expect(activeContentIn('0\nSECTION\n2\nENTITIES\n0\nTEXT\n1\n<script>alert(1)</script>\n0\nENDSEC\n0\nEOF\n', 'dxf')).toContain('a script')
  })
})

describe('uploaded file names', () => {
  it('drops control, direction and zero-width characters and folders', () => {
    expect(displayFileName('\u202Egvs.exe\u0000 😀 façade.svg', 'upload.svg')).toBe('gvs.exe 😀 façade.svg')
    expect(displayFileName('../../../../etc/passwd.svg', 'upload.svg')).toBe('passwd.svg')
    expect(displayFileName('C:\\Users\\me\\lid.svg', 'upload.svg')).toBe('lid.svg')
    expect(displayFileName('lid\u200B\u2066.svg', 'upload.svg')).toBe('lid.svg')
    expect(displayFileName('  \u0007 ', 'upload.svg')).toBe('upload.svg')
    expect(displayFileName('...hidden.svg', 'upload.svg')).toBe('hidden.svg')
  })

  it('normalises to NFC, so the same name is the same text however it was typed', () => {
    expect(displayFileName('facade\u0301.svg'.replace('e\u0301', 'e\u0301'), 'x')).toBe('facade\u0301.svg'.normalize('NFC'))
    expect(displayFileName('fac\u0327ade.svg', 'x')).toBe('façade.svg')
  })

  it('bounds a 10 000-character name, keeps its extension and never splits a character', () => {
    const name = displayFileName(`${'ш'.repeat(10_000)}.svg`, 'upload.svg')
    expect([...name].length).toBeLessThanOrEqual(MAX_FILE_NAME_CHARS)
    expect(name.endsWith('….svg')).toBe(true)
    const emoji = displayFileName(`${'😀'.repeat(500)}.dxf`, 'upload.dxf')
    expect([...emoji].length).toBeLessThanOrEqual(MAX_FILE_NAME_CHARS)
    expect(emoji).not.toMatch(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])/)
  })
})
