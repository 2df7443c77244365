/**
 * Length of the vector (dx, dy). Math.hypot guards against overflow at a cost
 * of several times the time in V8 (measured 30 ns against 4 ns a call); the
 * engine's coordinates are bounded by a kilometre, so the plain root cannot
 * overflow, and it differs from hypot by at most a rounding step.
 */
export function planarLength(dx: number, dy: number): number {
  return Math.sqrt(dx * dx + dy * dy)
}
