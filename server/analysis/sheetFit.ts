export interface SheetFit {
  fits: boolean
  rotated: boolean
  copies: number
  fitsBed: boolean
}

export interface SheetFitInput {
  partWidthMm: number
  partHeightMm: number
  sheetWidthMm: number
  sheetHeightMm: number
  bedWidthMm: number
  bedHeightMm: number
  marginMm: number
  /** Distance between copies: the kerf plus the chosen gap. */
  spacingMm: number
}

/**
 * Whether the part's bounding box fits the usable sheet (the sheet within the
 * bed, less the margin on every side) as drawn or turned 90°, and how many
 * copies a grid with the given spacing places on one sheet. The orientation
 * with more copies wins; as drawn on a tie.
 */
export function fitOnSheet(input: SheetFitInput): SheetFit {
  const usableWidth = Math.min(input.sheetWidthMm, input.bedWidthMm) - 2 * input.marginMm
  const usableHeight = Math.min(input.sheetHeightMm, input.bedHeightMm) - 2 * input.marginMm
  const asDrawn = gridCopies(input.partWidthMm, input.partHeightMm, usableWidth, usableHeight, input.spacingMm)
  const turned = gridCopies(input.partHeightMm, input.partWidthMm, usableWidth, usableHeight, input.spacingMm)
  const rotated = turned > asDrawn
  const copies = Math.max(asDrawn, turned)
  const bedWidth = input.bedWidthMm - 2 * input.marginMm
  const bedHeight = input.bedHeightMm - 2 * input.marginMm
  const fitsBed =
    gridCopies(input.partWidthMm, input.partHeightMm, bedWidth, bedHeight, 0) > 0 ||
    gridCopies(input.partHeightMm, input.partWidthMm, bedWidth, bedHeight, 0) > 0
  return { fits: copies > 0, rotated, copies, fitsBed }
}

// A part with no width (one straight line) and no spacing still takes some room.
const MIN_GRID_STEP_MM = 0.001

// n parts of size s with n−1 gaps g fit in U when n·s + (n−1)·g ≤ U, i.e. n = ⌊(U + g) / (s + g)⌋.
function gridCopies(partWidth: number, partHeight: number, usableWidth: number, usableHeight: number, spacing: number): number {
  if (usableWidth < partWidth || usableHeight < partHeight) return 0
  const across = Math.floor((usableWidth + spacing) / Math.max(partWidth + spacing, MIN_GRID_STEP_MM) + 1e-9)
  const down = Math.floor((usableHeight + spacing) / Math.max(partHeight + spacing, MIN_GRID_STEP_MM) + 1e-9)
  return across * down
}
