import { describe, expect, it } from 'vitest'
import { analyze, cutPath, mmDocument } from './helpers'

// SVG 1.1 §5.8.2 and SVG 2 §5.8: a <switch> renders only its first direct child whose conditional processing
// attributes evaluate to true. Lines of different lengths tell which child was drawn (a straight line's length).
const line = (lengthMm: number, attributes = '') => cutPath(`M0 10H${lengthMm}`, attributes)

describe('<switch>', () => {
  it('draws only the first child when none has conditions', () => {
    expect(analyze(mmDocument(`<switch>${line(10)}${line(20)}${line(30)}</switch>`, 100, 100)).cut.lengthMm).toBeCloseTo(10, 9)
  })

  it('skips children whose conditions fail and draws the first that passes', () => {
    const children = [
      line(11, 'requiredExtensions="http://example.org/an-extension-no-reader-has"'),
      line(12, 'systemLanguage="xx"'),
      line(13, 'requiredExtensions=""'),
      line(14, 'systemLanguage="de, en-GB"'),
      line(15),
    ]
    expect(analyze(mmDocument(`<switch>${children.join('')}</switch>`, 100, 100)).cut.lengthMm).toBeCloseTo(14, 9)
  })

  it('chooses among elements only, past title and desc, and draws a chosen group whole', () => {
    const svg = mmDocument(`<switch><title>part</title><desc>two lines</desc><g>${line(10)}${line(20)}</g>${line(40)}</switch>`, 100, 100)
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(30, 9)
  })

  it('draws nothing of the switch when no child passes', () => {
    const svg = mmDocument(`${line(5)}<switch>${line(10, 'systemLanguage="xx"')}</switch>`, 100, 100)
    expect(analyze(svg).cut.lengthMm).toBeCloseTo(5, 9)
  })
})
