declare module 'svgpath/lib/transform_parse.js' {
  interface TransformMatrix {
    toArray(): number[]
  }
  export default function parseTransformList(transform: string): TransformMatrix
}

declare module 'svgpath/lib/a2c.js' {
  /** Cubic Béziers [x1, y1, c1x, c1y, c2x, c2y, x2, y2] approximating an SVG arc, at most 90° each. */
  export default function a2c(
    x1: number,
    y1: number,
    x2: number,
    y2: number,
    largeArc: number,
    sweep: number,
    rx: number,
    ry: number,
    rotationDeg: number,
  ): number[][]
}
