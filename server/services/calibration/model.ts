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

/**
 * A job can teach the fit only when every number is finite, no component is negative and the model
 * gave it some time beyond setup; anything else is a recording mistake, not evidence.
 */
export function isUsableSample(sample: TimeSample): boolean {
  const numbers = [sample.cutS, sample.pierceS, sample.travelS, sample.setupS, sample.actualS]
  if (!numbers.every(Number.isFinite)) return false
  if (sample.cutS < 0 || sample.pierceS < 0 || sample.travelS < 0 || sample.setupS < 0 || sample.actualS <= 0) return false
  return modelledMotionS(sample) > 0
}
