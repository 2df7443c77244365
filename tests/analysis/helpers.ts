import { expect } from 'vitest'
import { AnalysisInputError, type AnalysisParams, type AnalysisResult, analyzeSvg, withDefaults } from '../../server/analysis/index'

export const CUT = '#c2185b'
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

/** `analyse` must refuse its file with a typed, member-readable error of this kind and status, and in bounded time (a generous bound: the point is "no hang", not a speed target). */
export function expectRefused(analyse: () => unknown, kind: string, status: number): void {
  const started = performance.now()
  try {
    analyse()
    expect.unreachable('should have been refused')
  } catch (error) {
    expect(error).toBeInstanceOf(AnalysisInputError)
    expect((error as AnalysisInputError).kind).toBe(kind)
    expect((error as AnalysisInputError).status).toBe(status)
    expect((error as AnalysisInputError).message.length).toBeGreaterThan(20)
  }
  expect(performance.now() - started).toBeLessThan(5000)
}
