import fc from 'fast-check'
import svgpath from 'svgpath'
import { describe, expect, it } from 'vitest'
import { CURVE_STRIDE, PathSteps, STEP_CLOSE, STEP_CURVE } from '../../server/analysis/pathSteps'
import { PROPERTY_TIMEOUT_MS } from './helpers'

// The reference is svgpath itself: the engine used it for all path data before this scanner took the common cases.
type Segment = [string, ...number[]]

const coordinate = fc.oneof(fc.integer({ min: -500, max: 500 }), fc.double({ min: -500, max: 500, noNaN: true }).map((value) => Number(value.toFixed(3))))
const separator = fc.constantFrom(' ', ',', ' , ', '\n')

function numbersText(values: number[], between: string): string {
  return values.map((value) => String(value)).join(between)
}

const command = fc.oneof(
  fc.tuple(fc.constantFrom('M', 'm', 'L', 'l'), fc.array(coordinate, { minLength: 2, maxLength: 6 })).map(([name, values]) => [name, values.slice(0, values.length - (values.length % 2))] as const),
  fc.tuple(fc.constantFrom('H', 'h', 'V', 'v'), fc.array(coordinate, { minLength: 1, maxLength: 3 })),
  fc.tuple(fc.constantFrom('C', 'c'), fc.array(coordinate, { minLength: 6, maxLength: 6 })),
  fc.tuple(fc.constantFrom('Q', 'q'), fc.array(coordinate, { minLength: 4, maxLength: 4 })),
  fc.tuple(fc.constantFrom('A', 'a'), coordinate, coordinate, coordinate, fc.constantFrom(0, 1), fc.constantFrom(0, 1), coordinate, coordinate).map(
    ([name, rx, ry, rotation, large, sweep, x, y]) => [name, [Math.abs(rx), Math.abs(ry), rotation, large, sweep, x, y]] as const,
  ),
  fc.constant(['Z', []] as const),
)

const pathData = fc.tuple(coordinate, coordinate, fc.array(fc.tuple(command, separator), { maxLength: 12 })).map(
  ([x, y, commands]) => `M${x} ${y}` + commands.map(([[name, values], between]) => `${name}${numbersText([...values], between)}`).join(''),
)

/** svgpath's absolute segments as end points, the way flatten.ts reads them. */
function svgpathSteps(data: string, matrix?: number[]): Array<{ x: number; y: number; curve?: Segment; close?: boolean }> {
  let path = svgpath(data)
  if (matrix) path = path.matrix(matrix)
  const segments = (path.abs().unshort() as unknown as { segments: Segment[] }).segments
  const steps: Array<{ x: number; y: number; curve?: Segment; close?: boolean }> = []
  let x = 0
  let y = 0
  let startX = 0
  let startY = 0
  for (const segment of segments) {
    const name = segment[0]
    if (name === 'Z') {
      x = startX
      y = startY
      steps.push({ x, y, close: true })
      continue
    }
    if (name === 'H') x = segment[1]!
    else if (name === 'V') y = segment[1]!
    else {
      x = segment[segment.length - 2] as number
      y = segment[segment.length - 1] as number
    }
    if (name === 'M') {
      startX = x
      startY = y
    }
    steps.push({ x, y, curve: name === 'C' || name === 'Q' || name === 'A' ? segment : undefined })
  }
  return steps
}

function scannedSteps(steps: PathSteps, matrix?: number[]): Array<{ x: number; y: number; curve?: Segment; close?: boolean }> {
  const [a, b, c, d, e, f] = (matrix ?? [1, 0, 0, 1, 0, 0]) as [number, number, number, number, number, number]
  let curve = 0
  return Array.from({ length: steps.count }, (_, step) => {
    const userX = steps.x[step]!
    const userY = steps.y[step]!
    const x = matrix ? userX * a + userY * c + e : userX
    const y = matrix ? userX * b + userY * d + f : userY
    if (steps.kind[step] === STEP_CLOSE) return { x, y, close: true }
    return { x, y, curve: steps.kind[step] === STEP_CURVE ? curveSegment(steps, curve++) : undefined }
  })
}

/** A curve of the scanner's flat storage in svgpath's segment form: the command, then its numbers. */
function curveSegment(steps: PathSteps, curve: number): Segment {
  const command = String.fromCharCode(steps.curveCommand[curve]!)
  const count = { C: 6, Q: 4, A: 7 }[command]!
  const offset = curve * CURVE_STRIDE
  return [command, ...steps.curveNumbers.subarray(offset, offset + count)]
}

describe('the path data scanner reads what svgpath reads', () => {
  it('gives svgpath’s absolute points and curve segments, number for number', () => {
    const steps = new PathSteps()
    fc.assert(
      fc.property(pathData, (data) => {
        expect(steps.read(data)).toBe(true)
        // Number for number: == also equates the −0 svgpath's abs() can leave with the +0 of a fresh sum.
        const expected = svgpathSteps(data)
        const scanned = scannedSteps(steps)
        expect(scanned.length).toBe(expected.length)
        scanned.forEach((step, index) => {
          expect(step.x == expected[index]!.x && step.y == expected[index]!.y).toBe(true)
          expect(step.close ?? false).toBe(expected[index]!.close ?? false)
          expect(step.curve?.map(String)).toEqual(expected[index]!.curve?.map(String))
        })
      }),
      { numRuns: 400 },
    )
  }, PROPERTY_TIMEOUT_MS)

  it('gives svgpath’s transformed points for straight path data', () => {
    const steps = new PathSteps()
    const straight = pathData.filter((data) => !/[CcQqAa]/.test(data))
    const matrix = fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 6, maxLength: 6 })
    fc.assert(
      fc.property(straight, matrix, (data, values) => {
        expect(steps.read(data)).toBe(true)
        const expected = svgpathSteps(data, values)
        const scanned = scannedSteps(steps, values)
        expect(scanned.length).toBe(expected.length)
        scanned.forEach((step, index) => expect(step.x == expected[index]!.x && step.y == expected[index]!.y).toBe(true))
      }),
      { numRuns: 400 },
    )
  }, PROPERTY_TIMEOUT_MS)

  it('leaves to svgpath what it does not take: S and T, exponents, syntax errors', () => {
    const steps = new PathSteps()
    for (const data of ['M0 0S1 1 2 2', 'M0 0T5 5', 'M0 0L1e3 5', 'L5 5', 'M0 0L05 1', 'M0 0Z 5', 'M0 0A1 1 0 2 1 5 5', 'M0 0L.', 'M0 0L1'] as const) {
      expect(steps.read(data)).toBe(false)
    }
  })
})
