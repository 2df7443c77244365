/** A length for a member-facing message: two decimals, then the unit. */
export function formatMm(valueMm: number): string {
  return `${valueMm.toFixed(2)} mm`
}
