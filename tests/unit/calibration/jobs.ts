import type { ComponentCoefficients, TimeSample } from '../../../server/services/calibration/model'
import { seededRandom } from '../../../scripts/lib/seeded-random'

// Box–Muller transform: two uniforms give one standard normal draw (standard textbook method).
function standardNormal(random: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random())
}

export interface JobGeneration {
  count: number
  seed: number
  hidden: ComponentCoefficients
  /** Standard deviation of the multiplicative noise on the motion time, e.g. 0.04 for 4 %. */
  relativeNoise?: number
  /** Staff log whole minutes, so the actual time is rounded to 60 s unless told otherwise. */
  roundToMinutes?: boolean
  withTravel?: boolean
}

export const SETUP_S = 300

/** Invented jobs: a few minutes to forty minutes of cutting, tens to hundreds of pierces, some travel. */
export function generateJobs(generation: JobGeneration): TimeSample[] {
  const random = seededRandom(generation.seed)
  const noise = generation.relativeNoise ?? 0
  return Array.from({ length: generation.count }, () => {
    const cutS = 120 + random() * 2280
    const pierceS = (5 + Math.floor(random() * 800)) * (0.3 + random() * 1.2)
    const travelS = generation.withTravel === false ? 0 : 20 + random() * 880
    const trueMotionS = generation.hidden.cut * cutS + generation.hidden.pierce * pierceS + generation.hidden.travel * travelS
    const trueS = SETUP_S + trueMotionS * (1 + noise * standardNormal(random))
    const actualS = generation.roundToMinutes === false ? trueS : Math.max(60, Math.round(trueS / 60) * 60)
    return { cutS, pierceS, travelS, setupS: SETUP_S, actualS }
  })
}

/** One finish time a day from a fixed start, oldest first. */
export function finishedOnDay(day: number): string {
  return new Date(Date.UTC(2025, 0, 1 + day, 16)).toISOString()
}

export const HIDDEN: ComponentCoefficients = { cut: 1.12, pierce: 0.8, travel: 1.3 }

export function maxRelativeDifference(found: ComponentCoefficients, expected: ComponentCoefficients): number {
  return Math.max(...(['cut', 'pierce', 'travel'] as const).map((component) => Math.abs(found[component] - expected[component]) / expected[component]))
}
