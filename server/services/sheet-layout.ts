import { MaxRectsPacker } from 'maxrects-packer/dist/maxrects-packer.mjs'

export interface PartToPlace {
  fileId: number
  widthMm: number
  heightMm: number
  quantity: number
}

export interface Placement {
  fileId: number
  copy: number
  x: number
  y: number
  /** Size as placed (swapped when rotated). */
  widthMm: number
  heightMm: number
  rotated: boolean
}

export interface SheetLayout {
  placements: Placement[]
  /** Share of the sheet covered by the parts' bounding boxes. */
  utilisation: number
}

export interface JobSheets {
  sheetWidthMm: number
  sheetHeightMm: number
  sheets: SheetLayout[]
  /** Files whose part is larger than the sheet (with margin), in either orientation. */
  tooLarge: number[]
}

/**
 * Places every copy of every part's bounding box on stock sheets with maxrects-packer (rotation allowed),
 * keeping `spacingMm` (at least kerf + gap) between parts and `marginMm` free along the sheet's edges.
 */
export function layoutSheets(parts: PartToPlace[], sheet: { widthMm: number; heightMm: number }, spacingMm: number, marginMm: number): JobSheets {
  const usableW = sheet.widthMm - 2 * marginMm
  const usableH = sheet.heightMm - 2 * marginMm
  const fits = (p: PartToPlace) => (p.widthMm <= usableW && p.heightMm <= usableH) || (p.heightMm <= usableW && p.widthMm <= usableH)
  const tooLarge = parts.filter((p) => !fits(p)).map((p) => p.fileId)
  // The packer keeps `padding` between rectangles (and none at the bin's edges, which the margin covers).
  const packer = new MaxRectsPacker(usableW, usableH, spacingMm, { smart: false, pot: false, square: false, allowRotation: true, border: 0 })
  for (const part of parts.filter(fits)) {
    for (let copy = 1; copy <= part.quantity; copy++) packer.add(part.widthMm, part.heightMm, { fileId: part.fileId, copy })
  }
  const sheets = packer.bins.map((bin) => {
    const placements: Placement[] = bin.rects.map((rect) => ({
      fileId: rect.data.fileId,
      copy: rect.data.copy,
      x: marginMm + rect.x,
      y: marginMm + rect.y,
      widthMm: rect.width,
      heightMm: rect.height,
      rotated: !!rect.rot,
    }))
    const covered = placements.reduce((sum, p) => sum + p.widthMm * p.heightMm, 0)
    return { placements, utilisation: covered / (sheet.widthMm * sheet.heightMm) }
  })
  return { sheetWidthMm: sheet.widthMm, sheetHeightMm: sheet.heightMm, sheets, tooLarge }
}
