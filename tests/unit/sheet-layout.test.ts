import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { layoutSheets } from '../../server/services/sheet-layout'

// Checked geometrically, independent of the packer: every placement lies inside the sheet's margin,
// no two placements on a sheet come closer than the spacing, and every copy is placed exactly once.
function gapBetween(a: { x: number; y: number; widthMm: number; heightMm: number }, b: typeof a): number {
  const dx = Math.max(b.x - (a.x + a.widthMm), a.x - (b.x + b.widthMm), 0)
  const dy = Math.max(b.y - (a.y + a.heightMm), a.y - (b.y + b.heightMm), 0)
  return Math.max(dx, dy)
}

describe('layoutSheets', () => {
  it('places every copy inside the margin, never overlapping, at least the spacing apart', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({ widthMm: fc.integer({ min: 5, max: 300 }), heightMm: fc.integer({ min: 5, max: 200 }), quantity: fc.integer({ min: 1, max: 8 }) }),
          { minLength: 1, maxLength: 8 },
        ),
        fc.double({ min: 0.1, max: 5, noNaN: true }),
        (parts, spacingMm) => {
          const sheet = { widthMm: 600, heightMm: 400 }
          const marginMm = 5
          const withIds = parts.map((p, i) => ({ ...p, fileId: i + 1 }))
          const layout = layoutSheets(withIds, sheet, spacingMm, marginMm)
          expect(layout.tooLarge).toEqual([])
          const placed = layout.sheets.flatMap((s) => s.placements)
          expect(placed.length).toBe(parts.reduce((n, p) => n + p.quantity, 0))
          for (const part of withIds) {
            const mine = placed.filter((p) => p.fileId === part.fileId)
            expect(new Set(mine.map((p) => p.copy)).size).toBe(part.quantity)
            for (const p of mine) {
              const asDrawn = p.widthMm === part.widthMm && p.heightMm === part.heightMm
              const turned = p.widthMm === part.heightMm && p.heightMm === part.widthMm
              expect(asDrawn || turned).toBe(true)
            }
          }
          for (const s of layout.sheets) {
            for (const p of s.placements) {
              expect(p.x).toBeGreaterThanOrEqual(marginMm - 1e-9)
              expect(p.y).toBeGreaterThanOrEqual(marginMm - 1e-9)
              expect(p.x + p.widthMm).toBeLessThanOrEqual(sheet.widthMm - marginMm + 1e-9)
              expect(p.y + p.heightMm).toBeLessThanOrEqual(sheet.heightMm - marginMm + 1e-9)
            }
            for (let i = 0; i < s.placements.length; i++) {
              for (let j = i + 1; j < s.placements.length; j++) expect(gapBetween(s.placements[i]!, s.placements[j]!)).toBeGreaterThanOrEqual(spacingMm - 1e-9)
            }
            const covered = s.placements.reduce((sum, p) => sum + p.widthMm * p.heightMm, 0)
            expect(s.utilisation).toBeCloseTo(covered / (sheet.widthMm * sheet.heightMm), 9)
          }
        },
      ),
      { numRuns: 60 },
    )
  })

  it('reports parts larger than the sheet instead of placing them', () => {
    const layout = layoutSheets(
      [
        { fileId: 7, widthMm: 700, heightMm: 20, quantity: 1 },
        { fileId: 8, widthMm: 20, heightMm: 20, quantity: 1 },
      ],
      { widthMm: 600, heightMm: 400 },
      1,
      5,
    )
    expect(layout.tooLarge).toEqual([7])
    expect(layout.sheets.flatMap((s) => s.placements).map((p) => p.fileId)).toEqual([8])
  })

  it('turns a part that fits only across the sheet', () => {
    const layout = layoutSheets([{ fileId: 1, widthMm: 100, heightMm: 500, quantity: 1 }], { widthMm: 600, heightMm: 400 }, 1, 5)
    expect(layout.sheets[0]!.placements[0]).toMatchObject({ widthMm: 500, heightMm: 100, rotated: true })
  })
})
