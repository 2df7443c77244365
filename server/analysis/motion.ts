import { grownArray } from './growArray'

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

/**
 * The speed limit on a curve of radius `radiusMm`: centripetal acceleration
 * v²/r (uniform circular motion) may not exceed `accel`, so v ≤ √(a·r).
 */
export function curveSpeedLimit(radiusMm: number, accel: number): number {
  return Math.sqrt(accel * radiusMm)
}

/**
 * Times polylines from rest to rest; one timer serves one analysis and keeps
 * its scratch arrays (per segment and per point) from contour to contour.
 */
export class PolylineTimer {
  private lengths = new Float64Array(256)
  private speeds = new Float64Array(257)
  private segmentLimit = new Float64Array(256)

  /**
   * Time to run the polyline with points xy[2·first … 2·end) at up to
   * `maxSpeed`: each vertex gets the lowest of the junction-deviation speed
   * and, where the polyline follows a curve, √(a·r) for the circle through the
   * vertex and its neighbours; the chords of such a curve (no longer than its
   * radius) keep that limit along their length. Then a forward pass (what
   * acceleration allows), a backward pass (what braking allows), and a
   * trapezoid or triangle per segment.
   */
  timeS(xy: Float64Array, first: number, end: number, maxSpeed: number, accel: number, deviationMm: number): number {
    const segmentCount = end - first - 1
    if (segmentCount <= 0) return 0
    if (segmentCount > this.lengths.length) {
      this.lengths = grownArray(this.lengths, 2 * segmentCount)
      this.speeds = grownArray(this.speeds, 2 * segmentCount + 1)
      this.segmentLimit = grownArray(this.segmentLimit, 2 * segmentCount)
    }
    // speeds[i]: the speed at point first + i; segmentLimit[i]: the top speed on segment i (from point first + i).
    const { lengths, speeds, segmentLimit } = this
    let lengthMm = 0
    for (let segment = 0; segment < segmentCount; segment++) {
      const point = first + segment
      lengths[segment] = Math.hypot(xy[2 * point + 2]! - xy[2 * point]!, xy[2 * point + 3]! - xy[2 * point + 1]!)
      lengthMm += lengths[segment]!
      segmentLimit[segment] = maxSpeed
    }
    if (accel <= 0) return lengthMm / maxSpeed
    for (let vertex = 1; vertex < segmentCount; vertex++) {
      const point = first + vertex
      const inX = xy[2 * point]! - xy[2 * point - 2]!
      const inY = xy[2 * point + 1]! - xy[2 * point - 1]!
      const outX = xy[2 * point + 2]! - xy[2 * point]!
      const outY = xy[2 * point + 3]! - xy[2 * point + 1]!
      const inLength = lengths[vertex - 1]!
      const outLength = lengths[vertex]!
      speeds[vertex] = maxSpeed
      if (inLength === 0 || outLength === 0) continue
      speeds[vertex] = junctionSpeed(inX / inLength, inY / inLength, outX / outLength, outY / outLength, maxSpeed, accel, deviationMm)
      // The circle through the three points: r = |AC| / (2·sin turn), with sin turn = |in × out| / (|in|·|out|).
      const sinTurn = Math.abs(inX * outY - inY * outX) / (inLength * outLength)
      if (sinTurn === 0) continue
      const radiusMm = Math.hypot(inX + outX, inY + outY) / (2 * sinTurn)
      const limit = curveSpeedLimit(radiusMm, accel)
      speeds[vertex] = Math.min(speeds[vertex]!, limit)
      if (inLength <= radiusMm) segmentLimit[vertex - 1] = Math.min(segmentLimit[vertex - 1]!, limit)
      if (outLength <= radiusMm) segmentLimit[vertex] = Math.min(segmentLimit[vertex]!, limit)
    }
    speeds[0] = 0
    speeds[segmentCount] = 0
    for (let vertex = 1; vertex < segmentCount; vertex++) speeds[vertex] = Math.min(speeds[vertex]!, segmentLimit[vertex - 1]!, segmentLimit[vertex]!)
    for (let segment = 0; segment < segmentCount; segment++) {
      speeds[segment + 1] = Math.min(speeds[segment + 1]!, Math.sqrt(speeds[segment]! * speeds[segment]! + 2 * accel * lengths[segment]!))
    }
    for (let segment = segmentCount - 1; segment >= 0; segment--) {
      speeds[segment] = Math.min(speeds[segment]!, Math.sqrt(speeds[segment + 1]! * speeds[segment + 1]! + 2 * accel * lengths[segment]!))
    }
    let timeS = 0
    for (let segment = 0; segment < segmentCount; segment++) {
      timeS += segmentTimeS(lengths[segment]!, speeds[segment]!, speeds[segment + 1]!, segmentLimit[segment]!, accel)
    }
    return timeS
  }
}
