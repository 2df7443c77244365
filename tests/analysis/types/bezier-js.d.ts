// bezier-js (the tests' reference for curve lengths) ships no types: the part of its API the tests call.
declare module 'bezier-js' {
  export interface BezierPoint {
    x: number
    y: number
  }
  export class Bezier {
    /** Quadratic from six coordinates, cubic from eight (x1, y1, …). */
    constructor(...coordinates: number[])
    length(): number
    getLUT(steps?: number): BezierPoint[]
    bbox(): { x: { min: number; max: number }; y: { min: number; max: number } }
  }
}
