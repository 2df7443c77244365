// svgpath's own transform-list parser: the SVG 1.1 transform syntax, one package for paths and transforms.
import parseTransformList from 'svgpath/lib/transform_parse.js'

/** An affine matrix [a, b, c, d, e, f] as SVG 1.1 defines it: x' = a·x + c·y + e, y' = b·x + d·y + f. */
export type Matrix = readonly [number, number, number, number, number, number]

export const IDENTITY: Matrix = [1, 0, 0, 1, 0, 0]

/** The matrix of `outer · inner`: applying the result equals applying `inner` first, then `outer`. */
export function multiply(outer: Matrix, inner: Matrix): Matrix {
  const [a1, b1, c1, d1, e1, f1] = outer
  const [a2, b2, c2, d2, e2, f2] = inner
  return [
    a1 * a2 + c1 * b2,
    b1 * a2 + d1 * b2,
    a1 * c2 + c1 * d2,
    b1 * c2 + d1 * d2,
    a1 * e2 + c1 * f2 + e1,
    b1 * e2 + d1 * f2 + f1,
  ]
}

export function translation(x: number, y: number): Matrix {
  return [1, 0, 0, 1, x, y]
}

export function scaling(sx: number, sy: number): Matrix {
  return [sx, 0, 0, sy, 0, 0]
}

export function parseTransform(transformAttribute: string | undefined): Matrix {
  if (!transformAttribute) return IDENTITY
  return parseTransformList(transformAttribute).toArray() as unknown as Matrix
}

export function applyX(m: Matrix, x: number, y: number): number {
  return m[0] * x + m[2] * y + m[4]
}

export function applyY(m: Matrix, x: number, y: number): number {
  return m[1] * x + m[3] * y + m[5]
}
