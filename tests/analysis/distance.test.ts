import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { hypot } from '../../server/analysis/distance'

// The reference is the runtime's own Math.hypot (ECMAScript's Math object), which the engine used before.
describe('vector length', () => {
  // Lengths and times must not move by a rounding step against the builtin the engine used before.
  it('measures vectors bit for bit like Math.hypot', () => {
    const component = fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }), fc.double(), fc.constantFrom(0, -0, 1e-300, 3))
    fc.assert(
      fc.property(component, component, (dx, dy) => {
        expect(Object.is(hypot(dx, dy), Math.hypot(dx, dy))).toBe(true)
      }),
      { numRuns: 20000 },
    )
  })
})
