import { expect } from 'vitest'
import { AnalysisInputError, type AnalysisParams, type AnalysisResult, analyzeSvg, withDefaults } from '../../server/analysis/index'

export const CUT = '#c2185b'
/**
 * Timeout for property tests of a few hundred runs: under a second alone, many times that on a machine shared with
 * other work. Only a bound against a hang; no test measures speed.
 */
export const PROPERTY_TIMEOUT_MS = 30_000
export const SCORE = '#00897b'

/** A document whose user unit is 1 mm, so expected values read directly in mm. */
export function mmDocument(body: string, widthMm = 500, heightMm = 500): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="${widthMm}mm" height="${heightMm}mm" viewBox="0 0 ${widthMm} ${heightMm}">${body}</svg>`
}

export function cutPath(d: string, extra = ''): string {
  return `<path d="${d}" fill="none" stroke="${CUT}" ${extra}/>`
}

export function analyze(svg: string, overrides: Partial<AnalysisParams> = {}): AnalysisResult {
  return analyzeSvg(svg, withDefaults(overrides))
}

// Ramanujan (1914), second approximation: P ≈ π(a + b)(1 + 3h / (10 + √(4 − 3h))), h = (a − b)² / (a + b)².
export function ramanujanPerimeter(a: number, b: number): number {
  const h = (a - b) ** 2 / (a + b) ** 2
  return Math.PI * (a + b) * (1 + (3 * h) / (10 + Math.sqrt(4 - 3 * h)))
}

/**
 * `analyse` must refuse its file with a typed, member-readable error of this kind and status. No clock is read: each
 * hostile input is built so that without its guard the outcome is different (it is read as a drawing, the stack
 * overflows with a RangeError, the heap runs out, or another check answers), so a guard that breaks fails here
 * however busy the machine. The guards stop at fixed counts (elements, entities, attributes, depth), which bounds their
 * work without a timer; speed belongs in the benchmarks, not in an assertion.
 */
export function expectRefused(analyse: () => unknown, kind: string, status: number): void {
  let refusal: unknown
  try {
    analyse()
  } catch (error) {
    refusal = error
  }
  expect(refusal, 'should have been refused').toBeInstanceOf(AnalysisInputError)
  const { kind: refusedKind, status: refusedStatus, message } = refusal as AnalysisInputError
  expect(refusedKind).toBe(kind)
  expect(refusedStatus).toBe(status)
  expect(message.length).toBeGreaterThan(20)
}
