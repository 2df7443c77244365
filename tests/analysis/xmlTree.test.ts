import fc from 'fast-check'
import { parseSync } from 'svgson'
import { describe, expect, it } from 'vitest'
import { parseXmlTree } from '../../server/analysis/xmlTree'
import { cutPath, mmDocument } from './helpers'

// Reference: svgson 5.3.1 (xml-reader 2.4.3, xml-lexer 2.4.3's state machine), the parser the engine used
// before. The engine's reader must give the same tree, or fail where svgson fails, for any text.
function outcome(parse: () => unknown): string {
  try {
    return JSON.stringify(parse())
  } catch {
    return 'fails'
  }
}

function expectSameAsSvgson(text: string): void {
  expect(outcome(() => parseXmlTree(text)), JSON.stringify(text.slice(0, 200))).toBe(outcome(() => parseSync(text)))
}

const FIXTURES = [
  mmDocument(cutPath('M0 0H10')),
  '<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE svg PUBLIC "-//W3C//DTD SVG 1.1//EN" "x.dtd">\n<svg xmlns="http://www.w3.org/2000/svg"><g id="a"><path d="M0 0L1 1"/></g></svg>',
  '<svg><!-- a comment with "quotes" and > signs --><path d="M0 0"/></svg>',
  '<svg><style><![CDATA[ .a { stroke: red } path > g { } ]]></style><path class="a" d="M0 0h1"/></svg>',
  '<svg><style>  </style><text x="1" y="2">Label &amp; more <tspan>inner</tspan> tail</text></svg>',
  "<svg width='10' height=10 viewBox = \"0 0 10 10\"><rect x=1 y=2 width=3 height=4/></svg>",
  '<svg><rect x="1" hidden y="2"/><circle r="1" cx="2" disabled /></svg>',
  '<svg a="x\'y" b=\'x"y\' c="a>b/c<d=e"></svg>',
  '<svg><svg x="1"><g/></svg></svg>',
  '<svg/>',
  '<svg></svg><svg></svg>',
  ' \n <svg> text at the top </svg> \n ',
  'text<svg/>',
  '<svg><g></svg>',
  '<svg><g></x></g></svg>',
  '<svg></x></svg><svg></svg>',
  '<svg><path d="M0 0"',
  '<svg><![CDATA[ never closed',
  '< svg ><  g  / ></ svg >',
  '</svg>',
  '<svg><a/b="1"/></svg>',
  '<svg><a b="1"c="2"/></svg>',
  '<svg><a b=/></svg>',
  '<svg><a b= "1" / ></svg>',
  '<svg>\r\n\t<g\r\n\tid="x"\r\n\t/>\r\n</svg>',
  '<svg><?pi some stuff?>text after pi<g/></svg>',
  '<svg><!DOCTYPE x>after<g/></svg>',
  '<svg><__proto__ __proto__="1" constructor="2"/></svg>',
  '<svg><![CDATA[x]]><![CDATA[]]]]><g/></svg>',
  '<svg><![CDATA x]]></svg>',
  '<svg>></svg>',
  '<svg><>g</></svg>',
  '<svg><g/ ></svg>',
  '<svg><g a="1"b/></svg>',
]

describe('the SVG tree reader against svgson', () => {
  it('gives the same tree, or fails alike, on documents with every construct the lexer knows', () => {
    for (const text of FIXTURES) expectSameAsSvgson(text)
  })

  it('agrees on random text made of the characters that steer the lexer', () => {
    const piece = fc.constantFrom('<', '>', '/', '=', '"', "'", ' ', '\n', '!', '?', '[', ']', '-', 'svg', 'g', 'a', 'CDATA', '<![CDATA[', ']]>', '<svg', '</svg>', '<svg>', '<g ', 'd="M0 0"', 'x')
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 40 }), (pieces) => expectSameAsSvgson(pieces.join(''))),
      { numRuns: 3000, seed: 42 },
    )
  })

  it('agrees on mutated and truncated drawings', () => {
    const drawing = FIXTURES.slice(0, 9).join('').replace(/<\/svg><svg[^>]*>/g, '')
    const mutation = fc.record({
      at: fc.nat({ max: drawing.length }),
      removed: fc.nat({ max: 4 }),
      inserted: fc.constantFrom('', '<', '>', '/', '"', "'", '=', ' ', '<g>', '</g>', '<!--', '-->', ']]>'),
      cut: fc.boolean(),
    })
    fc.assert(
      fc.property(fc.array(mutation, { minLength: 1, maxLength: 3 }), (mutations) => {
        let text = drawing
        for (const { at, removed, inserted, cut } of mutations) {
          const position = Math.min(at, text.length)
          text = cut ? text.slice(0, position) : text.slice(0, position) + inserted + text.slice(position + removed)
        }
        expectSameAsSvgson(text)
      }),
      { numRuns: 3000, seed: 7 },
    )
  })
})
