/**
 * Math.hypot(dx, dy), bit for bit: the same arithmetic as the runtime's
 * builtin for two finite arguments (both scaled by the larger, which makes
 * that one exactly 1, then the root of the sum of squares, times the larger),
 * without the builtin's call, which costs several times the arithmetic in the
 * per-point loops. Zero, infinite and NaN arguments go to the builtin.
 */
export function hypot(dx: number, dy: number): number {
  const absX = Math.abs(dx)
  const absY = Math.abs(dy)
  const larger = absX > absY ? absX : absY
  if (!(larger > 0 && larger < Infinity)) return Math.hypot(dx, dy)
  const ratio = (absX > absY ? absY : absX) / larger
  return Math.sqrt(1 + ratio * ratio) * larger
}
