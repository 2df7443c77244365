import { describe, expect, it } from 'vitest'
import { circlePath, findingsOf, rectanglePath } from './helpers'

// 3 mm steel, 0.2 mm kerf: withDefaults derives a 1.5 mm minimum bridge and a 3 mm minimum hole (common practice, no source).
const steel3mm = { thicknessMm: 3, kerfMm: 0.2 }
const CHORD_TOLERANCE_MM = 0.01

// A 50 × 30 part with a Ø2 hole whose edge is 1 mm from the part's left edge.
const PART = rectanglePath(0, 0, 50, 30)
const HOLE_RADIUS_MM = 1
const HOLE = circlePath(1 + HOLE_RADIUS_MM, 15, HOLE_RADIUS_MM)
// A 10 mm line 20 mm to the right of the part.
const STRAY_LINE = 'M70 15H80'

describe('a stray open line outside a part', () => {
  it.each([
    ['without', [PART, HOLE]],
    ['with', [PART, HOLE, STRAY_LINE]],
  ])('%s the line, the part keeps its narrow bridge and small hole', (_label, paths) => {
    const bridges = findingsOf('narrow-bridge', paths, steel3mm)
    expect(bridges).toHaveLength(1)
    // Closed form: the hole's edge is centre x − r = 1 mm from the line x = 0; the web is that minus the kerf.
    // The flattened circle's chords lie inside the circle, so the web can only grow, by at most the chord tolerance.
    expect(bridges[0]!.valueMm!).toBeGreaterThan(1 - 0.2 - 1e-6)
    expect(bridges[0]!.valueMm!).toBeLessThan(1 - 0.2 + CHORD_TOLERANCE_MM)
    expect(bridges[0]!.contours.sort()).toEqual([0, 1])
    const holes = findingsOf('small-hole', paths, steel3mm)
    expect(holes).toHaveLength(1)
    // Closed form: the diameter 2r.
    expect(holes[0]!.valueMm!).toBeCloseTo(2 * HOLE_RADIUS_MM, 5)
    expect(holes[0]!.contours).toEqual([1])
  })

  it('a long diagonal line past a corner leaves it a part too', () => {
    const strays = ['M-25 20L20 -25']
    expect(findingsOf('small-hole', [PART, HOLE, ...strays], steel3mm)).toHaveLength(1)
    expect(findingsOf('narrow-bridge', [PART, HOLE, ...strays], steel3mm)).toHaveLength(1)
  })

  it('leaves the hinges between slit ends and an outlined panel alone (a stray line beside the panel)', () => {
    // A 60 × 40 panel; rows of slits every 10 mm that stop 0.6 mm short of its left and right edges (hinges of 0.4 mm after the kerf).
    const slits = [10, 20, 30].map((y) => `M0.6 ${y}H59.4`)
    const panel = [rectanglePath(0, 0, 60, 40), ...slits]
    const withoutStray = findingsOf('narrow-bridge', panel, steel3mm)
    const withStray = findingsOf('narrow-bridge', [...panel, 'M100 20H110'], steel3mm)
    expect(withoutStray).toHaveLength(6)
    expect(withStray.map((site) => [site.x, site.y, site.valueMm])).toEqual(withoutStray.map((site) => [site.x, site.y, site.valueMm]))
    for (const site of withStray) expect(site.valueMm!).toBeCloseTo(0.6 - 0.2, 6)
  })

  it('still takes closed cuts among free slits as holes in an undrawn sheet (a fold pattern without its outline)', () => {
    // A Ø1 relief hole between two rows of slits: no outline, so the sheet's edge is undrawn and the circle drops out.
    const holes = findingsOf('small-hole', ['M0 0H100', 'M0 20H100', circlePath(50, 10, 0.5)], steel3mm)
    expect(holes).toHaveLength(1)
    expect(holes[0]!.valueMm!).toBeCloseTo(1, 5)
  })

  it('keeps a part drawn beside a fold pattern a part', () => {
    const pattern = ['M0 0H100', 'M0 20H100', circlePath(50, 10, 0.5)]
    const part = [rectanglePath(150, 0, 50, 30), circlePath(152, 15, 1)]
    const holes = findingsOf('small-hole', [...pattern, ...part], steel3mm)
    expect(holes.map((site) => site.contours[0]).sort()).toEqual([2, 4])
  })
})
