import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { AnalysisInputError } from '../../server/analysis/index'
import { analyze, cutPath, expectRefused, mmDocument } from './helpers'

function expectInputError(svg: string, kind: string, status: number): void {
  expectRefused(() => analyze(svg), kind, status)
}

describe('bad input gets a typed, member-readable error', () => {
  it('refuses text that is not XML or not SVG with 415', () => {
    expectInputError('hello, this is a text file', 'notSvg', 415)
    expectInputError('<html><body>page</body></html>', 'notSvg', 415)
    expectInputError('\x89PNG\r\n\x1a\n', 'notSvg', 415)
  })

  it('refuses broken XML with 422', () => {
    expectInputError('<svg><g></svg>', 'malformedXml', 422)
  })

  it('refuses entity declarations (expansion bombs and external entities)', () => {
    const bomb = '<?xml version="1.0"?><!DOCTYPE svg [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]><svg><text>&c;</text></svg>'
    expectInputError(bomb, 'unsafeXml', 422)
    expectInputError('<!DOCTYPE svg [<!ENTITY x SYSTEM "file:///etc/passwd">]><svg><text>&x;</text></svg>', 'unsafeXml', 422)
  })

  it('accepts a plain DOCTYPE without entities', () => {
    const svg = `<?xml version="1.0"?><!DOCTYPE svg PUBLIC "-//W3C//DTD SVG 1.1//EN" "http://www.w3.org/Graphics/SVG/1.1/DTD/svg11.dtd">${mmDocument(cutPath('M0 0H10'))}`
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(10, 9)
  })

  it('refuses 100 000 nested groups without overflowing the stack', () => {
    const depth = 100_000
    expectInputError(mmDocument(`${'<g>'.repeat(depth)}${cutPath('M0 0H10')}${'</g>'.repeat(depth)}`), 'tooComplex', 422)
  })

  // SVG 1.1 §9.7: points is a list of coordinate pairs separated by whitespace and/or commas.
  it('reads polyline points in any separator style and refuses a bad one by name', () => {
    const polyline = (points: string) => mmDocument(`<polyline points="${points}" stroke="#c2185b" fill="none"/>`)
    expect(analyze(polyline(' 0,0 10,0\n10 , 5\t')).cut.lengthMm).toBeCloseTo(15, 9)
    expect(analyze(polyline('0 0,10 0 10 5 0')).cut.lengthMm).toBeCloseTo(15, 9)
    for (const bad of ['0,0 10,0 NaN,5', '0,0 1-2 5,5', '0,0 10,0 1e999,5', '0,0 10,0 7px,5']) {
      try {
        analyze(polyline(bad))
        expect.unreachable(bad)
      } catch (error) {
        expect((error as AnalysisInputError).kind, bad).toBe('badNumber')
        expect((error as AnalysisInputError).message, bad).toContain('points="')
      }
    }
  })

  it('refuses a tag crowded with attributes, and still reads a long path in one tag', () => {
    const crowded = Array.from({ length: 2001 }, (_, index) => `a${index}="1"`).join(' ')
    expectInputError(mmDocument(`<rect x="0" y="0" width="5" height="5" stroke="#c2185b" fill="none" ${crowded}/>`), 'tooComplex', 422)
    // 2 000 segments make a tag far longer than a crowded one, but with few attributes.
    const longPath = `M0 0${'h0.005'.repeat(2000)}`
    expect(analyze(mmDocument(cutPath(longPath))).cut.lengthMm).toBeCloseTo(10, 6)
  })

  it('answers quickly when a file is full of unclosed angle brackets', () => {
    expectInputError(`<svg xmlns="http://www.w3.org/2000/svg">${'<a '.repeat(200_000)}`, 'malformedXml', 422)
  })

  it('refuses <use> references that multiply or refer to themselves', () => {
    const levels = Array.from({ length: 9 }, (_, level) => `<g id="l${level + 1}">${Array.from({ length: 10 }, () => `<use href="#l${level}"/>`).join('')}</g>`)
    expectInputError(mmDocument(`<defs>${cutPath('M0 0H1', 'id="l0"')}${levels.join('')}</defs><use href="#l9"/>`), 'tooComplex', 422)
    expectInputError(mmDocument(`<g id="loop">${cutPath('M0 0H1')}<use href="#loop" x="1"/></g>`), 'tooComplex', 422)
  })

  it.each([
    ['NaN', 'badNumber'],
    ['Infinity', 'badNumber'],
    ['1e300', 'outOfRange'],
  ])('refuses %s coordinates', (value, kind) => {
    expectInputError(mmDocument(cutPath(`M0 0L${value} 5`)), kind, 422)
    expectInputError(mmDocument(`<circle cx="${value}" cy="0" r="4" stroke="#c2185b" fill="none"/>`), kind, 422)
  })

  it('refuses an empty drawing, zero or negative viewBox and unknown units', () => {
    expectInputError(mmDocument(''), 'empty', 422)
    expectInputError(mmDocument('<text x="1" y="1">only words</text>'), 'empty', 422)
    expectInputError(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 0 10">${cutPath('M0 0H10')}</svg>`, 'badSize', 422)
    expectInputError(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 -5 10">${cutPath('M0 0H10')}</svg>`, 'badSize', 422)
    expectInputError(`<svg xmlns="http://www.w3.org/2000/svg" width="10em" height="10em">${cutPath('M0 0H10')}</svg>`, 'badUnit', 422)
    expectInputError(`<svg xmlns="http://www.w3.org/2000/svg" width="10furlong">${cutPath('M0 0H10')}</svg>`, 'badUnit', 422)
  })

  it('never throws anything but AnalysisInputError on generated path data', () => {
    const command = fc.constantFrom('M', 'm', 'L', 'l', 'H', 'h', 'V', 'v', 'C', 'c', 'S', 's', 'Q', 'q', 'T', 't', 'A', 'a', 'Z', 'z')
    const number = fc.oneof(fc.double({ min: -1e4, max: 1e4, noNaN: true }).map(String), fc.constantFrom('0', '1', '-0', 'NaN', '1e300', '.5.5', ''))
    const pathData = fc.array(fc.tuple(command, fc.array(number, { maxLength: 8 })), { maxLength: 12 }).map((parts) => parts.map(([letter, numbers]) => `${letter}${numbers.join(' ')}`).join(' '))
    fc.assert(
      fc.property(pathData, (d) => {
        try {
          const result = analyze(mmDocument(cutPath(d)))
          expect(Number.isFinite(result.time.totalS)).toBe(true)
        } catch (error) {
          expect(error).toBeInstanceOf(AnalysisInputError)
        }
      }),
      { numRuns: 300 },
    )
  })
})
