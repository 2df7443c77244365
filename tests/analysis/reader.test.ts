import { describe, expect, it } from 'vitest'
import type { AnalysisResult } from '../../server/analysis/index'
import { analyze, CUT, cutPath, mmDocument, SCORE } from './helpers'
import { groupOf, sitesOf } from './sites'

/** The codes the reader itself reports (readSvg.ts); the design-rule checks add their own groups to the same list. */
const READER_CODES = new Set(['text-not-outlined', 'raster-image', 'unmapped-colour'])

function readerFindings(result: AnalysisResult) {
  return sitesOf(result).filter((site) => READER_CODES.has(site.code))
}

describe('what is drawn and how', () => {
  // SVG 1.1 §14–§15 and §11.7: defs, clipPath and mask content, display:none, visibility:hidden and zero opacity paint nothing.
  it('does not cut hidden things', () => {
    const hidden = [
      `<defs>${cutPath('M0 0H10')}</defs>`,
      `<clipPath id="c">${cutPath('M0 0H10')}</clipPath>`,
      `<mask id="m">${cutPath('M0 0H10')}</mask>`,
      cutPath('M0 0H10', 'display="none"'),
      `<g style="display:none">${cutPath('M0 0H10')}</g>`,
      cutPath('M0 0H10', 'visibility="hidden"'),
      cutPath('M0 0H10', 'stroke-opacity="0"'),
      `<g opacity="0">${cutPath('M0 0H10')}</g>`,
      cutPath('M0 0H10', 'stroke-width="0"'),
    ]
    for (const snippet of hidden) {
      const result = analyze(mmDocument(`${snippet}${cutPath('M100 100H150')}`))
      expect(result.cut.lengthMm, snippet).toBeCloseTo(50, 9)
    }
  })

  // SVG 1.1 §11.7: visibility is inherited but a child may set visible again.
  it('cuts a visible child of a hidden group', () => {
    expect(analyze(mmDocument(`<g visibility="hidden">${cutPath('M0 0H10', 'visibility="visible"')}</g>`)).cut.lengthMm).toBeCloseTo(10, 9)
  })

  // SVG 1.1 §6.4 and CSS: inline style beats attributes, properties inherit from groups, currentColor takes the color property.
  it('takes the operation from the effective stroke colour', () => {
    const svg = mmDocument(
      [
        `<path d="M0 0H10" fill="none" stroke="#000" style="stroke:${SCORE}"/>`,
        `<g stroke="${SCORE}"><path d="M0 20H20" fill="none"/></g>`,
        `<g color="${SCORE}"><path d="M0 40H30" fill="none" stroke="currentColor"/></g>`,
        `<style>.outline { stroke: ${CUT}; fill: none }</style><path class="outline" d="M0 60H40"/>`,
      ].join(''),
    )
    const result = analyze(svg)
    expect(result.score.lengthMm).toBeCloseTo(10 + 20 + 30, 9)
    expect(result.cut.lengthMm).toBeCloseTo(40, 9)
    expect(readerFindings(result)).toEqual([])
  })

  // DOM getElementById (WHATWG DOM §4.2.4, "the first element, in tree order") and CSS cascade order (CSS Cascading 4 §6.1: of equal specificity, the last declared wins).
  it('takes the first of equal ids in document order, and the later of two style sheets', () => {
    const twoIds = mmDocument(`<defs><g id="part">${cutPath('M0 0H10')}</g><g id="other"><g id="part">${cutPath('M0 0H30')}</g></g></defs><use href="#part"/>`)
    expect(analyze(twoIds).cut.lengthMm).toBeCloseTo(10, 9)
    const twoSheets = mmDocument(`<g><style>.line { stroke: ${CUT}; fill: none }</style></g><style>.line { stroke: ${SCORE} }</style><path class="line" d="M0 0H10" fill="none"/>`)
    const result = analyze(twoSheets)
    expect(result.score.lengthMm).toBeCloseTo(10, 9)
    expect(result.cut.lengthMm).toBe(0)
  })

  it('matches colours within the mapping tolerance and reports unmapped ones once, counting their lines', () => {
    const nearCut = '#c51a5e'
    const result = analyze(mmDocument(`${cutPath('M0 0H10', `stroke="${nearCut}"`).replace(`stroke="${CUT}" `, '')}<path d="M0 10H10" stroke="#123456"/><path d="M0 20H10" stroke="#123456"/>`))
    expect(result.cut.lengthMm).toBeCloseTo(30, 9)
    const unmapped = sitesOf(result, 'unmapped-colour')
    expect(unmapped).toHaveLength(1)
    expect(unmapped[0]).toMatchObject({ x: 0, y: 10, cause: '#123456' })
    expect(groupOf(result, 'unmapped-colour')?.facts).toMatchObject({ colour: '#123456', lines: 2, countedAs: 'cut' })
    expect(analyze(mmDocument('<path d="M0 0H10" stroke="#9e9e9e"/>' + cutPath('M0 5H5'))).cut.lengthMm).toBeCloseTo(5, 9)
  })

  it('treats fill-only shapes as engrave areas', () => {
    const result = analyze(mmDocument(`<rect x="10" y="10" width="20" height="30" fill="#f9a825"/>${cutPath('M0 0H1')}`))
    expect(result.engrave.areaMm2).toBeCloseTo(600, 9)
    expect(result.cut.lengthMm).toBeCloseTo(1, 9)
  })

  it('reports text and raster images at their position in mm', () => {
    const result = analyze(mmDocument(`<g transform="translate(5 6)"><text x="10" y="20">label</text><image x="1" y="2" width="5" height="5" href="data:image/png;base64,AAAA"/></g>${cutPath('M0 0H1')}`))
    expect(readerFindings(result).map(({ code, x, y }) => ({ code, x, y }))).toEqual([
      { code: 'text-not-outlined', x: 15, y: 26 },
      { code: 'raster-image', x: 6, y: 8 },
    ])
  })
})

describe('chaining into contours', () => {
  it('makes a square drawn as four lines in any direction one closed contour and one pierce', () => {
    const lines = ['M0 0L10 0', 'M10 10L10 0', 'M10 10L0 10', 'M0 0L0 10.005'].map((d) => cutPath(d)).join('')
    const result = analyze(mmDocument(lines))
    expect(result.cut).toMatchObject({ pierces: 1, closedContours: 1, openContours: 0 })
    expect(result.cut.lengthMm).toBeCloseTo(40.005, 9)
  })

  it('keeps ends farther apart than the tolerance separate', () => {
    const result = analyze(mmDocument(cutPath('M0 0H10') + cutPath('M10.02 0H20')))
    expect(result.cut).toMatchObject({ pierces: 2, openContours: 2 })
  })

  it('chains a long zig-zag of separate lines into one open contour', () => {
    const lines = Array.from({ length: 500 }, (_, index) => cutPath(`M${index} ${index % 2}L${index + 1} ${(index + 1) % 2}`))
    const reversedOrder = lines.reverse().join('')
    expect(analyze(mmDocument(reversedOrder)).cut).toMatchObject({ pierces: 1, openContours: 1 })
  })

  it('does not chain lines of different operations', () => {
    expect(analyze(mmDocument(cutPath('M0 0H10') + `<path d="M10 0H20" stroke="${SCORE}"/>`)).cut.pierces).toBe(1)
  })

  it('runs inner contours before the outline that contains them', () => {
    // A hole whose start is far from the origin and an outline starting at the origin: a plain nearest-neighbour tour would cut the outline first.
    const svg = mmDocument(cutPath('M0 0H100V100H0Z') + cutPath('M80 80h10v10h-10Z'))
    const result = analyze(svg)
    expect(result.travelMm).toBeCloseTo(Math.hypot(80, 80) * 2, 9)
  })
})
