import { describe, expect, it } from 'vitest'
import type { FindingGroup } from '../../shared/finding-groups'
import { describeGroup, describeSite, FINDING_TITLES, findingTitle, formatCount, formatMeasure, formatRangeMm } from '../../shared/finding-messages'
import { analyzeSvg, withDefaults } from '../../server/analysis/index'
import { cutPath, mmDocument } from '../analysis/helpers'

const NBSP = '\u00a0'

function group(fields: Partial<FindingGroup> & Pick<FindingGroup, 'code'>): FindingGroup {
  return { key: '', severity: 'warning', cause: '', count: 1, facts: {}, stats: null, box: [0, 0, 0, 0], firstSite: 0, ...fields }
}

const stats = (min: number, max: number) => ({ min, median: (min + max) / 2, max, histogram: { fromMm: min, toMm: max, counts: [1] } })

describe('numbers in messages', () => {
  it('sets thousands apart and gives a range, or one length when both ends read the same', () => {
    expect(formatCount(22500)).toBe(`22${NBSP}500`)
    expect(formatCount(1234567)).toBe(`1${NBSP}234${NBSP}567`)
    expect(formatCount(999)).toBe('999')
    expect(formatRangeMm(1.5, 1.62)).toBe('1.50–1.62 mm')
    expect(formatRangeMm(0.6, 0.6001)).toBe('0.60 mm')
  })
})

describe('describeGroup', () => {
  it('says how many bridges, how wide after the kerf and the limit', () => {
    const bridges = group({ code: 'narrow-bridge', cause: 'between-cuts', count: 22500, facts: { limitMm: 3, kerfMm: 0.2, thicknessMm: 6, minBridgeMm: 3 }, stats: stats(1.5, 1.62) })
    const { title, headline, advice } = describeGroup(bridges)
    expect(title).toBe('Bridge too narrow')
    expect(headline).toBe(`22${NBSP}500 bridges between cuts are 1.50–1.62 mm wide after the kerf (limit 3.00 mm)`)
    expect(advice).toContain('6.00 mm material')
  })

  it('uses the singular for one, and tells a neck from a bridge between cuts', () => {
    const neck = group({ code: 'narrow-bridge', cause: 'neck', count: 1, facts: { limitMm: 1, kerfMm: 0.2, thicknessMm: 2, minBridgeMm: 1 }, stats: stats(0.8, 0.8) })
    expect(describeGroup(neck).headline).toBe('1 neck within one cut is 0.80 mm wide after the kerf (limit 1.00 mm)')
  })

  it('says the cuts overlap, never a width below zero, when the kerfs run into each other', () => {
    const facts = { limitMm: 3, kerfMm: 0.2, thicknessMm: 6, minBridgeMm: 3 }
    const overlapping = group({ code: 'narrow-bridge', cause: 'between-cuts', count: 1, facts, stats: stats(-0.7, -0.7) })
    expect(describeGroup(overlapping).headline).toBe('1 bridge between cuts is not there: the cuts overlap by 0.70 mm after the kerf (limit 3.00 mm)')
    const mixed = group({ code: 'narrow-bridge', cause: 'between-cuts', count: 3, facts, stats: stats(-0.7, 1.2) })
    expect(describeGroup(mixed).headline).toBe('3 bridges between cuts range from cuts overlapping by 0.70 mm to 1.20 mm wide after the kerf (limit 3.00 mm)')
    expect(describeGroup(mixed).headline).not.toMatch(/-\d/)
  })

  it('gives burnt-away bridges as the distance between the cuts against the kerf', () => {
    const burnt = group({ code: 'narrow-bridge', severity: 'error', cause: 'between-cuts', count: 2, facts: { limitMm: 0, kerfMm: 0.2, thicknessMm: 3, minBridgeMm: 1.5 }, stats: stats(-0.1, -0.05) })
    const { headline, advice } = describeGroup(burnt)
    expect(headline).toBe('2 bridges between cuts burn away: the cuts are 0.10–0.15 mm apart, no more than the kerf (0.20 mm)')
    expect(advice).toContain('1.70 mm apart')
  })

  it('makes the sheet message from the drawing and usable sizes, the margin and the count of lines beyond', () => {
    const sheet = group({ code: 'outside-sheet', cause: 'beyond-sheet', facts: { limitMm: 590, drawingWidthMm: 800, drawingHeightMm: 100, usableWidthMm: 590, usableHeightMm: 390, marginMm: 5, linesOutside: 3 } })
    const { headline, advice } = describeGroup(sheet)
    expect(headline).toBe('The drawing is 800.00 mm × 100.00 mm; the chosen sheet leaves 590.00 mm × 390.00 mm after the 5.00 mm margin')
    expect(advice).toContain('3 lines lie beyond')
  })

  it("passes on a material's refusal reason as staff wrote it", () => {
    const reason = 'This plastic gives off a corrosive gas when heated.'
    expect(describeGroup(group({ code: 'material-not-allowed', severity: 'error', facts: { reason } })).advice).toBe(reason)
  })

  it('names the colour and the lines drawn in it, and the layer for DXF', () => {
    expect(describeGroup(group({ code: 'unmapped-colour', cause: '#123456', facts: { format: 'svg', colour: '#123456', countedAs: 'cut', lines: 2 } })).headline).toBe(
      "2 lines drawn in colour #123456 are not in the workshop's colour mapping",
    )
    expect(describeGroup(group({ code: 'unmapped-colour', facts: { format: 'dxf', layer: 'PARTS', colour: '#ff0000', countedAs: 'cut', lines: 1 } })).headline).toContain('1 line on layer "PARTS" in colour #ff0000 is')
  })

  it('gives duplicate lines with their total length and seconds', () => {
    const duplicates = group({ code: 'duplicate-cut', count: 2, facts: { toleranceMm: 0.02, lengthMm: 400, seconds: 40 } })
    expect(describeGroup(duplicates).headline).toBe('2 lines are drawn twice: 400.00 mm in all, about 40.0 s more cutting')
  })

  it('has a title and a headline with the count for every code the engine reports', () => {
    for (const code of Object.keys(FINDING_TITLES)) {
      const facts = { limitMm: 1, kerfMm: 0.2, thicknessMm: 3, lengthMm: 1, seconds: 1, toleranceMm: 0.01, lines: 7, chainToleranceMm: 0.01, reason: 'Not on this cutter.' }
      const sizes = { drawingWidthMm: 800, drawingHeightMm: 100, usableWidthMm: 590, usableHeightMm: 390, marginMm: 5, linesOutside: 3 }
      const { title, headline, advice } = describeGroup(group({ code, count: 7, facts: { ...facts, ...sizes }, stats: stats(0.5, 0.9) }))
      expect(title).toBe(findingTitle(code))
      expect(headline.length, code).toBeGreaterThan(10)
      expect(headline, code).not.toContain('NaN')
      expect(advice.length, code).toBeGreaterThan(10)
    }
    expect(describeGroup(group({ code: 'something-new', count: 3 })).headline).toBe('3 × something-new')
  })
})

describe('describeSite', () => {
  it('gives a site its number only', () => {
    const bridges = group({ code: 'narrow-bridge', cause: 'between-cuts', facts: { limitMm: 3, kerfMm: 0.2 } })
    expect(describeSite(bridges, 1.523)).toBe('1.52 mm wide (limit 3.00 mm)')
    expect(describeSite(bridges, -0.05)).toBe('0.15 mm apart (kerf 0.20 mm)')
    expect(describeSite(group({ code: 'small-hole', facts: { limitMm: 3 } }), 1)).toBe('1.00 mm across (limit 3.00 mm)')
    expect(describeSite(group({ code: 'open-contour', cause: 'slit' }), Number.NaN)).toBe('')
  })
})

// Lengths are stored in mm and read in inches by those who choose them. The inch is exactly 25.4 mm (NIST Special
// Publication 811, appendix B.8), so the sizes below are whole thousandths of an inch written out in mm: each
// expected reading is the inch figure the millimetres were made from, not a division by our own code.
const IN = 25.4

describe('messages in inches', () => {
  it('gives a length and a range in thousandths of an inch, and millimetres unless told otherwise', () => {
    // NIST SP 811, B.8: 1 in = 25.4 mm; 1 mil = 0.001 in = 0.0254 mm.
    expect(formatMeasure(IN, 'in')).toBe('1.000 in')
    expect(formatMeasure(0.0254, 'in')).toBe('0.001 in')
    expect(formatMeasure(0.060 * IN, 'in')).toBe('0.060 in')
    expect(formatRangeMm(0.060 * IN, 0.064 * IN, 'in')).toBe('0.060–0.064 in')
    expect(formatRangeMm(0.060 * IN, 0.0602 * IN, 'in')).toBe('0.060 in')
    // The demo birch's 3 mm: 3 / 25.4 = 0.11811… in.
    expect(formatMeasure(3, 'in')).toBe('0.118 in')
    expect(formatMeasure(3)).toBe('3.00 mm')
    expect(formatMeasure(3, 'mm')).toBe('3.00 mm')
  })

  it('says the same of a group in both units', () => {
    const facts = { limitMm: 0.120 * IN, kerfMm: 0.008 * IN, thicknessMm: 0.25 * IN, minBridgeMm: 0.120 * IN }
    const bridges = group({ code: 'narrow-bridge', cause: 'between-cuts', count: 12, facts, stats: stats(0.060 * IN, 0.064 * IN) })
    expect(describeGroup(bridges, 'in').headline).toBe('12 bridges between cuts are 0.060–0.064 in wide after the kerf (limit 0.120 in)')
    expect(describeGroup(bridges, 'in').advice).toBe(
      'The minimum bridge for 0.250 in material on this cutter is 0.120 in; narrower ones may tear or burn through. Move the cuts apart, or choose the thinner material the pattern may be drawn for.',
    )
    // The same group in mm: 0.060 in = 1.524 mm, 0.064 in = 1.6256 mm, 0.120 in = 3.048 mm, 0.25 in = 6.35 mm.
    expect(describeGroup(bridges).headline).toBe('12 bridges between cuts are 1.52–1.63 mm wide after the kerf (limit 3.05 mm)')
    expect(describeGroup(bridges, 'mm').advice).toContain('6.35 mm material')
    expect(describeGroup(bridges, 'in').headline).not.toContain('mm')
  })

  it('shifts a burnt-away range by the kerf before converting, and adds kerf and bridge for the advice', () => {
    const burnt = group({
      code: 'narrow-bridge',
      severity: 'error',
      count: 2,
      facts: { limitMm: 0, kerfMm: 0.010 * IN, thicknessMm: 0.125 * IN, minBridgeMm: 0.060 * IN },
      stats: stats(-0.005 * IN, -0.002 * IN),
    })
    const { headline, advice } = describeGroup(burnt, 'in')
    expect(headline).toBe('2 bridges between cuts burn away: the cuts are 0.005–0.008 in apart, no more than the kerf (0.010 in)')
    expect(advice).toContain('at least 0.070 in apart')
  })

  it('gives the sheet, holes, duplicate lines and thickness in inches', () => {
    // A 24 × 16 in sheet, 0.2 in margin, a 30 × 4 in drawing (all exact in mm at 25.4 mm to the inch).
    const sheet = group({ code: 'outside-sheet', cause: 'beyond-sheet', facts: { limitMm: 23.6 * IN, drawingWidthMm: 30 * IN, drawingHeightMm: 4 * IN, usableWidthMm: 23.6 * IN, usableHeightMm: 15.6 * IN, marginMm: 0.2 * IN, linesOutside: 1 } })
    expect(describeGroup(sheet, 'in').headline).toBe('The drawing is 30.000 in × 4.000 in; the chosen sheet leaves 23.600 in × 15.600 in after the 0.200 in margin')
    const holes = group({ code: 'small-hole', count: 3, facts: { limitMm: 0.04 * IN, thicknessMm: 0.125 * IN }, stats: stats(0.02 * IN, 0.03 * IN) })
    expect(describeGroup(holes, 'in').headline).toBe('3 holes are 0.020–0.030 in across (smallest for 0.125 in material: 0.040 in)')
    const duplicates = group({ code: 'duplicate-cut', count: 2, facts: { toleranceMm: 0.001 * IN, lengthMm: 16 * IN, seconds: 40 } })
    expect(describeGroup(duplicates, 'in')).toMatchObject({ headline: '2 lines are drawn twice: 16.000 in in all, about 40.0 s more cutting', advice: expect.stringContaining('within 0.001 in of each other') })
    const thick = group({ code: 'too-thick', severity: 'error', facts: { thicknessMm: 0.5 * IN, limitMm: 0.25 * IN } })
    expect(describeGroup(thick, 'in').headline).toBe('The material is 0.500 in thick; this cutter cuts at most 0.250 in')
  })

  it('gives a site in inches', () => {
    const bridges = group({ code: 'narrow-bridge', cause: 'between-cuts', facts: { limitMm: 0.120 * IN, kerfMm: 0.008 * IN } })
    expect(describeSite(bridges, 0.061 * IN, 'in')).toBe('0.061 in wide (limit 0.120 in)')
    expect(describeSite(bridges, -0.003 * IN, 'in')).toBe('0.005 in apart (kerf 0.008 in)')
    expect(describeSite(bridges, 0.061 * IN)).toBe('1.55 mm wide (limit 3.05 mm)')
    expect(describeSite(group({ code: 'open-contour', cause: 'nearly-closed' }), 0.002 * IN, 'in')).toBe('ends 0.002 in apart')
  })

  it('writes no millimetres into any inch message the engine can report', () => {
    const facts = { limitMm: 1, kerfMm: 0.2, thicknessMm: 3, minBridgeMm: 1, lengthMm: 1, seconds: 1, toleranceMm: 0.01, lines: 7, chainToleranceMm: 0.01, reason: 'Not on this cutter.' }
    const sizes = { drawingWidthMm: 800, drawingHeightMm: 100, usableWidthMm: 590, usableHeightMm: 390, marginMm: 5, linesOutside: 3 }
    for (const code of Object.keys(FINDING_TITLES)) {
      for (const cause of ['', 'neck', 'touch', 'nearly-closed', 'beyond-bed']) {
        const { headline, advice } = describeGroup(group({ code, cause, count: 7, facts: { ...facts, ...sizes }, stats: stats(0.5, 0.9) }), 'in')
        const site = describeSite(group({ code, cause, facts }), 0.5, 'in')
        for (const text of [headline, advice, site]) expect(text, `${code} ${cause}`).not.toMatch(/\bmm\b|NaN/)
      }
    }
  })
})

describe('messages of engine groups', () => {
  it('describes what the engine found on a drawing with narrow bridges and slits', () => {
    const body = ['M10 10H60', 'M10 11H60', 'M10 30H60', 'M10 31.1H60'].map((d) => cutPath(d)).join('')
    const result = analyzeSvg(mmDocument(body), withDefaults({ kerfMm: 0.2, minBridgeMm: 1.5, thicknessMm: 3 }))
    expect(result.findingGroups.map((found) => describeGroup(found).headline)).toEqual([
      '2 bridges between cuts are 0.80–0.90 mm wide after the kerf (limit 1.50 mm)',
      '4 open cuts (slits)',
    ])
  })
})

describe('groups converted from revisions stored before grouping', () => {
  it('speak with the stored sentence and plain lengths, never with missing numbers', () => {
    const legacy = { code: 'narrow-bridge', cause: '', count: 3, facts: { message: 'A web 1.20 mm wide is left between two cuts.', limitMm: 3 }, stats: null }
    const { headline } = describeGroup(legacy)
    expect(headline).toBe('3 places: A web 1.20 mm wide is left between two cuts.')
    expect(describeSite(legacy, 1.2)).toBe('1.20 mm')
    expect(`${headline} ${describeSite(legacy, 1.2)}`).not.toMatch(/NaN|undefined/)
  })
})
