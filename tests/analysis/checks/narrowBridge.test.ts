import { describe, expect, it } from 'vitest'
import { circlePath, findingsOf, rectanglePath, SHEET_OUTLINE } from './helpers'

// Hand-worked geometry: the web left between two cuts is the distance between their centre lines less the kerf
// (each cut removes half a kerf on either side of its line, so two halves come off the web).
// Sites are stored as 32-bit floats (about seven significant digits), hence six decimals.
describe('narrow-bridge, hand-worked', () => {
  it('leaves 1.0 − 0.2 = 0.8 mm between two parallel slits 1.0 mm apart', () => {
    const [site, ...rest] = findingsOf('narrow-bridge', ['M10 10H60', 'M10 11H60'])
    expect(rest).toEqual([])
    expect(site).toMatchObject({ severity: 'warning', cause: 'between-cuts', limitMm: 1, key: 'narrow-bridge:between-cuts:1' })
    expect(site!.valueMm).toBeCloseTo(0.8, 6)
    expect(site!.y).toBeCloseTo(10.5, 6)
    expect(site!.contours).toHaveLength(2)
  })

  it('leaves 0.5 − 0.2 = 0.3 mm between a slit and a circle it ends 0.5 mm short of', () => {
    const [site, ...rest] = findingsOf('narrow-bridge', ['M10 50H44.5', circlePath(50, 50, 5)])
    expect(rest).toEqual([])
    expect(site!.valueMm).toBeCloseTo(0.3, 6)
    expect(site!.x).toBeCloseTo(44.75, 6)
  })

  it('is an error when the kerf eats the whole web (0.15 mm apart, 0.2 mm kerf)', () => {
    const [site] = findingsOf('narrow-bridge', ['M10 10H60', 'M10 10.15H60'])
    expect(site).toMatchObject({ severity: 'error', cause: 'between-cuts', limitMm: 0 })
    expect(site!.valueMm).toBeCloseTo(-0.05, 6)
  })

  it('finds a neck of one outline: two 20 mm squares joined by a 1 mm wide strip leave 0.8 mm', () => {
    const [site, ...rest] = findingsOf('narrow-bridge', ['M0 0H20V9.5H25V0H45V20H25V10.5H20V20H0Z'])
    expect(rest).toEqual([])
    expect(site!.valueMm).toBeCloseTo(0.8, 6)
    expect(site).toMatchObject({ cause: 'neck', contours: [0] })
  })

  it("ignores a contour's own corners and curves: rectangles, circles, a rounded slot, a 60° triangle", () => {
    const shapes = [rectanglePath(10, 10, 30, 5), circlePath(80, 80, 3), 'M100 20h20a2 2 0 0 1 0 4h-20a2 2 0 0 1 0 -4z', 'M20 150l20 0l-10 17.32z']
    expect(findingsOf('narrow-bridge', shapes, { kerfMm: 0.2, minBridgeMm: 1.5 })).toEqual([])
  })

  it('leaves the inside of a narrow slot alone: it drops out, it is not a bridge', () => {
    expect(findingsOf('narrow-bridge', [SHEET_OUTLINE, rectanglePath(20, 20, 40, 1)])).toEqual([])
  })

  it('measures each web of three slits 0.5 mm apart once and not the outer two across the middle one', () => {
    const sites = findingsOf('narrow-bridge', ['M10 10H60', 'M10 10.5H60', 'M10 11H60'])
    expect(sites.map((site) => site.valueMm)).toEqual([expect.closeTo(0.3, 6), expect.closeTo(0.3, 6)])
  })

  it('leaves webs at or above the minimum alone (1.2 mm apart − 0.2 mm kerf = 1.0 mm)', () => {
    expect(findingsOf('narrow-bridge', ['M10 10H60', 'M10 11.2001H60'])).toEqual([])
  })
})
