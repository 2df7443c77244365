// Lengths shown in inches: the conversion checked against the definition of the inch, not against our own code.
import { describe, expect, it } from 'vitest'
import { formatArea, formatLength, MM_PER_INCH } from '../../shared/units'

describe('lengths and areas in the reader’s unit', () => {
  it('uses the international inch', () => {
    // NIST Special Publication 811 (2008), appendix B.8: 1 in = 2.54 cm exactly.
    expect(MM_PER_INCH).toBe(2.54 * 10)
  })

  it('shows lengths in inches to the thousandth', () => {
    // NIST SP 811, B.8: 1 ft = 0.3048 m exactly, and 12 in to the foot.
    expect(formatLength(304.8, 'in')).toBe('12 in')
    // NIST SP 811, B.8: 1 mil (0.001 in) = 0.0254 mm exactly; a 0.1 mm kerf is 3.937 mil.
    expect(formatLength(0.1, 'in')).toBe('0.004 in')
    expect(formatLength(3, 'in')).toBe('0.118 in')
    expect(formatLength(1000, 'mm')).toBe('1000 mm')
    expect(formatLength(0.7, 'mm')).toBe('0.7 mm')
  })

  it('shows areas in square inches', () => {
    // NIST SP 811, B.8: 1 in² = 6.4516 cm² exactly; 1 ft² = 0.09290304 m² exactly = 144 in².
    expect(formatArea(645.16, 'in')).toBe('1 in²')
    expect(formatArea(92_903.04, 'in')).toBe('144 in²')
    expect(formatArea(1234.4, 'mm')).toBe('1234 mm²')
  })
})
