// The time model the calibration corrects: total = a·cut + b·pierce + c·travel + setup.
// Setup is a fixed allowance set by the workshop, so it is never scaled.

export const CORRECTED_COMPONENTS = ['cut', 'pierce', 'travel'] as const
export type CorrectedComponent = (typeof CORRECTED_COMPONENTS)[number]

export type ComponentCoefficients = Record<CorrectedComponent, number>

export interface TimeComponents {
  cutS: number
  pierceS: number
  travelS: number
  setupS: number
}

/** One finished job: the engine's components as recorded at finish, and the time actually logged. */
export interface TimeSample extends TimeComponents {
  actualS: number
}

/** The model as the engine computes it, before any calibration. */
export const UNCORRECTED: Readonly<ComponentCoefficients> = Object.freeze({ cut: 1, pierce: 1, travel: 1 })

const SECONDS_FIELD = { cut: 'cutS', pierce: 'pierceS', travel: 'travelS' } as const satisfies Record<CorrectedComponent, keyof TimeComponents>

export function componentSeconds(components: TimeComponents, component: CorrectedComponent): number {
  return components[SECONDS_FIELD[component]]
}

/** The corrected estimate in seconds. */
export function applyCorrection(components: TimeComponents, coefficients: ComponentCoefficients): number {
  let seconds = components.setupS
  for (const component of CORRECTED_COMPONENTS) seconds += coefficients[component] * componentSeconds(components, component)
  return seconds
}

/** Seconds the model spends on the corrected components, i.e. everything but setup. */
export function modelledMotionS(components: TimeComponents): number {
  return components.cutS + components.pierceS + components.travelS
}

// A job under a second of modelled motion says nothing about the coefficients; one over a week is an entry error.
const MIN_MODELLED_MOTION_S = 1
const MAX_PLAUSIBLE_S = 7 * 24 * 3600

/**
 * A job can teach the fit only when every number is a plausible time (finite, 0 … a week), the actual
 * time is positive and the model gave it at least a second beyond setup; anything else is a recording
 * mistake, not evidence.
 */
export function isUsableSample(sample: TimeSample): boolean {
  const times = [sample.cutS, sample.pierceS, sample.travelS, sample.setupS, sample.actualS]
  if (!times.every((seconds) => Number.isFinite(seconds) && seconds >= 0 && seconds <= MAX_PLAUSIBLE_S)) return false
  return sample.actualS > 0 && modelledMotionS(sample) >= MIN_MODELLED_MOTION_S
}
