import { hypot } from './distance'

/**
 * Constant-acceleration motion: time to cover `lengthMm` starting at
 * `entrySpeed` and ending at `exitSpeed` (mm/s), never faster than `maxSpeed`,
 * accelerating and braking at `accel` (mm/s²). A trapezoid when the head
 * reaches full speed, a triangle when the move is too short. The callers
 * guarantee entry and exit speeds are reachable within the length.
 */
export function segmentTimeS(lengthMm: number, entrySpeed: number, exitSpeed: number, maxSpeed: number, accel: number): number {
  if (accel <= 0) return lengthMm / maxSpeed
  // v² = v0² + 2·a·d for each ramp (constant-acceleration kinematics).
  const peakSquared = (2 * accel * lengthMm + entrySpeed * entrySpeed + exitSpeed * exitSpeed) / 2
  if (peakSquared <= maxSpeed * maxSpeed) {
    const peak = Math.sqrt(peakSquared)
    return (2 * peak - entrySpeed - exitSpeed) / accel
  }
  const rampsMm = (2 * maxSpeed * maxSpeed - entrySpeed * entrySpeed - exitSpeed * exitSpeed) / (2 * accel)
  return (2 * maxSpeed - entrySpeed - exitSpeed) / accel + (lengthMm - rampsMm) / maxSpeed
}

/** A straight move from rest to rest (a slit, a rapid travel). */
export function restToRestTimeS(lengthMm: number, maxSpeed: number, accel: number): number {
  return segmentTimeS(lengthMm, 0, 0, maxSpeed, accel)
}

/**
 * The speed a junction between two segments allows under the
 * junction-deviation cornering model (common practice in motion controllers,
 * no formal source): the head may pass the corner on an arc that deviates
 * `deviationMm` from it, at the speed whose centripetal acceleration is `accel`.
 */
export function junctionSpeed(ux1: number, uy1: number, ux2: number, uy2: number, maxSpeed: number, accel: number, deviationMm: number): number {
  const cosTurn = ux1 * ux2 + uy1 * uy2
  if (cosTurn >= 1 - 1e-12) return maxSpeed
  // θ is the angle between the incoming reversed and outgoing directions; sin(θ/2) from the half-angle identity.
  const sinHalfTheta = Math.sqrt(Math.max(0, (1 + cosTurn) / 2))
  if (deviationMm <= 0 || sinHalfTheta <= 0) return 0
  if (sinHalfTheta >= 1) return maxSpeed
  return Math.min(maxSpeed, Math.sqrt((accel * deviationMm * sinHalfTheta) / (1 - sinHalfTheta)))
}

/** Reusable scratch space for the planner, so a contour costs no allocation per point. */
export class PolylinePlanner {
  private lengths = new Float64Array(256)
  private speeds = new Float64Array(257)

  /**
   * Time to run a polyline (points xy[2·first … 2·end)) from rest to rest:
   * corner speeds from the junction model, then a forward pass (what
   * acceleration allows) and a backward pass (what braking allows).
   */
  timeS(xy: Float64Array, first: number, end: number, maxSpeed: number, accel: number, deviationMm: number): number {
    const segmentCount = end - first - 1
    if (segmentCount <= 0) return 0
    if (accel <= 0) {
      let lengthMm = 0
      for (let point = first; point < end - 1; point++) lengthMm += hypot(xy[2 * point + 2] - xy[2 * point], xy[2 * point + 3] - xy[2 * point + 1])
      return lengthMm / maxSpeed
    }
    this.ensureCapacity(segmentCount)
    const { lengths, speeds } = this
    let previousUx = 0
    let previousUy = 0
    speeds[0] = 0
    for (let segment = 0; segment < segmentCount; segment++) {
      const point = first + segment
      const dx = xy[2 * point + 2] - xy[2 * point]
      const dy = xy[2 * point + 3] - xy[2 * point + 1]
      const length = hypot(dx, dy)
      lengths[segment] = length
      const ux = length > 0 ? dx / length : previousUx
      const uy = length > 0 ? dy / length : previousUy
      if (segment > 0) speeds[segment] = junctionSpeed(previousUx, previousUy, ux, uy, maxSpeed, accel, deviationMm)
      previousUx = ux
      previousUy = uy
    }
    speeds[segmentCount] = 0
    for (let segment = 0; segment < segmentCount; segment++) {
      speeds[segment + 1] = Math.min(speeds[segment + 1], Math.sqrt(speeds[segment] * speeds[segment] + 2 * accel * lengths[segment]))
    }
    for (let segment = segmentCount - 1; segment >= 0; segment--) {
      speeds[segment] = Math.min(speeds[segment], Math.sqrt(speeds[segment + 1] * speeds[segment + 1] + 2 * accel * lengths[segment]))
    }
    let timeS = 0
    for (let segment = 0; segment < segmentCount; segment++) timeS += segmentTimeS(lengths[segment], speeds[segment], speeds[segment + 1], maxSpeed, accel)
    return timeS
  }

  private ensureCapacity(segmentCount: number): void {
    if (segmentCount <= this.lengths.length) return
    const size = Math.max(segmentCount, this.lengths.length * 2)
    this.lengths = new Float64Array(size)
    this.speeds = new Float64Array(size + 1)
  }
}
