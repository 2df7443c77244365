/**
 * A fold sheet of our own design for the bridge tests: straight fold lines
 * made of collinear slits with pinch gaps between them (each slit drawn as
 * two pieces that chain), a short cross slit ending just short of the middle
 * of every slit (a T-pinch), and a ring-shaped fold of arc slits. Every gap is
 * known by construction, so the expected bridges come from the layout, not
 * from the engine.
 */
export interface PinchBridge {
  /** Centre-line distance between the two cuts at the pinch. */
  gapMm: number
  /** Middle of the pinch. */
  x: number
  y: number
}

export interface FoldSheet {
  svgBody: string
  bridges: PinchBridge[]
}

const SLIT_MM = 8
const ROW_PITCH_MM = 10
const CROSS_SLIT_MM = 3
const EDGE_MM = 10

/**
 * `gapOf(row, gap)` gives each straight pinch gap; `crossGapMm` is the gap under
 * every T-pinch; the ring has `ringGapsDeg.length` arc slits with those angular gaps.
 */
export function foldSheet(rows: number, gapsPerRow: number, gapOf: (row: number, gap: number) => number, crossGapMm: number, ringGapsDeg: number[]): FoldSheet {
  const parts: string[] = []
  const bridges: PinchBridge[] = []
  let widestRowMm = 0
  for (let row = 0; row < rows; row++) {
    const y = EDGE_MM + row * ROW_PITCH_MM
    // Odd rows start half a slit further in, as hinge patterns stagger their slits.
    let x = EDGE_MM + (row % 2) * (SLIT_MM / 2)
    for (let slit = 0; slit <= gapsPerRow; slit++) {
      const middle = x + SLIT_MM / 2
      parts.push(`M${x} ${y}H${middle}`, `M${middle} ${y}H${x + SLIT_MM}`)
      parts.push(`M${middle} ${y + crossGapMm}v${CROSS_SLIT_MM}`)
      bridges.push({ gapMm: crossGapMm, x: middle, y: y + crossGapMm / 2 })
      x += SLIT_MM
      if (slit === gapsPerRow) break
      const gapMm = gapOf(row, slit)
      bridges.push({ gapMm, x: x + gapMm / 2, y })
      x += gapMm
    }
    widestRowMm = Math.max(widestRowMm, x)
  }
  const ringRadiusMm = 20
  const ringCentreX = widestRowMm + EDGE_MM + ringRadiusMm
  const ringCentreY = EDGE_MM + ringRadiusMm
  const pointAt = (degrees: number): [number, number] => [
    ringCentreX + ringRadiusMm * Math.cos((degrees * Math.PI) / 180),
    ringCentreY + ringRadiusMm * Math.sin((degrees * Math.PI) / 180),
  ]
  const slitDeg = (360 - ringGapsDeg.reduce((sum, gap) => sum + gap, 0)) / ringGapsDeg.length
  let angle = 0
  for (const gapDeg of ringGapsDeg) {
    const [startX, startY] = pointAt(angle)
    const [endX, endY] = pointAt(angle + slitDeg)
    parts.push(`M${startX} ${startY}A${ringRadiusMm} ${ringRadiusMm} 0 0 1 ${endX} ${endY}`)
    const [nextX, nextY] = pointAt(angle + slitDeg + gapDeg)
    // Both ends lie on the circle, so the gap is the chord 2r·sin(Δθ/2).
    bridges.push({ gapMm: 2 * ringRadiusMm * Math.sin((gapDeg * Math.PI) / 360), x: (endX + nextX) / 2, y: (endY + nextY) / 2 })
    angle += slitDeg + gapDeg
  }
  const widthMm = ringCentreX + ringRadiusMm + EDGE_MM
  const heightMm = Math.max(EDGE_MM + rows * ROW_PITCH_MM, ringCentreY + ringRadiusMm + EDGE_MM)
  parts.push(`M0 0H${widthMm}V${heightMm}H0Z`)
  return { svgBody: parts.map((d) => `<path d="${d}" fill="none" stroke="#c2185b"/>`).join(''), bridges }
}
