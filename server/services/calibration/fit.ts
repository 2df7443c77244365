import { Matrix, SingularValueDecomposition, solve } from 'ml-matrix'
import {
  type ComponentCoefficients,
  CORRECTED_COMPONENTS,
  type CorrectedComponent,
  componentSeconds,
  isUsableSample,
  modelledMotionS,
  type TimeSample,
  UNCORRECTED,
} from './model'
import { nearestRankPercentile } from './statistics'

export interface FitOptions {
  /** Huber's tuning constant in units of the robust residual scale; Infinity gives plain weighted least squares. */
  huberTuning?: number
  /** Every fitted coefficient is clipped into this range. */
  coefficientRange?: { min: number; max: number }
  maxIterations?: number
}

/**
 * components: one coefficient per component carrying enough of the time;
 * scale: the data cannot tell the components apart, so one factor scales all fitted components;
 * none: no usable sample, the model stays as it is.
 */
export type FitModel = 'components' | 'scale' | 'none'

export interface TimeCorrectionFit {
  coefficients: ComponentCoefficients
  model: FitModel
  /** Samples given. */
  samples: number
  /** Samples that entered the fit (see isUsableSample). */
  usedSamples: number
  /** Components whose coefficient was fitted; the others carry too little time to judge and stay at 1. */
  fittedComponents: CorrectedComponent[]
  /** Fitted components whose coefficient hit the edge of coefficientRange. */
  clippedComponents: CorrectedComponent[]
  /** Samples whose residual lay beyond Huber's threshold and so counted less than fully. */
  downweightedSamples: number
  /** Robust scale of the relative residuals (share of the modelled motion time), before clipping. */
  relativeResidualScale: number
  iterations: number
  converged: boolean
}

// Huber (1964) ψ; k = 1.345 keeps 95 % efficiency when errors are normal (Holland & Welsch 1977, from memory).
const DEFAULT_HUBER_TUNING = 1.345
const DEFAULT_COEFFICIENT_RANGE = { min: 0.5, max: 2.0 }
const DEFAULT_MAX_ITERATIONS = 50
const COEFFICIENT_TOLERANCE = 1e-10
// Median absolute residual / Φ⁻¹(0.75) estimates σ for normal errors (the MAD scale used by IRLS, from memory).
const MAD_TO_SIGMA = 1 / 0.6745
// Below a tenth of a per cent the scale is rounding noise; the floor keeps weights finite when most jobs fit exactly.
const RELATIVE_SCALE_FLOOR = 1e-3
// A component under 2 % of all modelled motion time cannot be told from noise.
const MIN_SHARE_OF_MOTION_TIME = 0.02
// Condition index above 30 on unit-length columns marks serious collinearity (Belsley, Kuh & Welsch 1980, from memory).
const CONDITION_LIMIT = 30
// A separate coefficient per component needs at least two jobs per coefficient; fewer fall back to one factor.
const SAMPLES_PER_COEFFICIENT = 2

/**
 * Fits actualS − setupS ≈ a·cutS + b·pierceS + c·travelS by iteratively reweighted least squares with
 * Huber weights. Residuals are taken relative to each job's modelled motion time, so a long job and a
 * short one count by their percentage error, and one wild job gets a weight that shrinks with its
 * residual instead of pulling the fit.
 */
export function fitTimeCorrection(samples: readonly TimeSample[], options: FitOptions = {}): TimeCorrectionFit {
  const huberTuning = options.huberTuning ?? DEFAULT_HUBER_TUNING
  const range = options.coefficientRange ?? DEFAULT_COEFFICIENT_RANGE
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS
  const usable = samples.filter(isUsableSample)
  if (usable.length === 0) {
    return {
      coefficients: { ...UNCORRECTED },
      model: 'none',
      samples: samples.length,
      usedSamples: 0,
      fittedComponents: [],
      clippedComponents: [],
      downweightedSamples: 0,
      relativeResidualScale: 0,
      iterations: 0,
      converged: true,
    }
  }

  const fittedComponents = componentsWithEnoughTime(usable)
  const motionS = usable.map(modelledMotionS)
  // Components left out keep coefficient 1, so their seconds move to the known side of the equation.
  const target = usable.map((sample, row) => {
    let unexplainedS = sample.actualS - sample.setupS
    for (const component of CORRECTED_COMPONENTS) {
      if (!fittedComponents.includes(component)) unexplainedS -= componentSeconds(sample, component)
    }
    return unexplainedS / motionS[row]!
  })
  const componentDesign = usable.map((sample, row) => fittedComponents.map((component) => componentSeconds(sample, component) / motionS[row]!))

  const model: FitModel = canSeparateComponents(componentDesign, fittedComponents.length) ? 'components' : 'scale'
  const design = model === 'components' ? componentDesign : componentDesign.map((row) => [row.reduce((sum, share) => sum + share, 0)])
  const robust = huberRegression(design, target, huberTuning, maxIterations)

  const coefficients = { ...UNCORRECTED }
  const clippedComponents: CorrectedComponent[] = []
  fittedComponents.forEach((component, index) => {
    const estimate = robust.coefficients[model === 'components' ? index : 0]!
    // isUsableSample keeps the numbers small enough that this cannot happen; the promise is never NaN all the same.
    const clipped = Number.isFinite(estimate) ? Math.min(range.max, Math.max(range.min, estimate)) : UNCORRECTED[component]
    if (clipped !== estimate) clippedComponents.push(component)
    coefficients[component] = clipped
  })

  return {
    coefficients,
    model,
    samples: samples.length,
    usedSamples: usable.length,
    fittedComponents,
    clippedComponents,
    downweightedSamples: robust.weights.filter((weight) => weight < 1).length,
    relativeResidualScale: robust.scale,
    iterations: robust.iterations,
    converged: robust.converged,
  }
}

function componentsWithEnoughTime(samples: readonly TimeSample[]): CorrectedComponent[] {
  const totalMotionS = samples.reduce((sum, sample) => sum + modelledMotionS(sample), 0)
  return CORRECTED_COMPONENTS.filter((component) => {
    const componentTotalS = samples.reduce((sum, sample) => sum + componentSeconds(sample, component), 0)
    return componentTotalS >= MIN_SHARE_OF_MOTION_TIME * totalMotionS
  })
}

function canSeparateComponents(design: number[][], columns: number): boolean {
  if (columns < 2 || design.length < SAMPLES_PER_COEFFICIENT * columns) return false
  const matrix = new Matrix(design)
  for (let column = 0; column < columns; column++) {
    const norm = matrix.getColumnVector(column).norm()
    matrix.setColumn(column, matrix.getColumn(column).map((value) => value / norm))
  }
  const condition = new SingularValueDecomposition(matrix, { autoTranspose: true }).condition
  return Number.isFinite(condition) && condition <= CONDITION_LIMIT
}

interface RobustRegression {
  coefficients: number[]
  weights: number[]
  scale: number
  iterations: number
  converged: boolean
}

/** IRLS: start from least squares, then repeatedly weight each row by Huber's w(r) = min(1, k·s/|r|) and re-solve. */
function huberRegression(design: number[][], target: number[], huberTuning: number, maxIterations: number): RobustRegression {
  let weights = target.map(() => 1)
  let coefficients = weightedLeastSquares(design, target, weights)
  let scale = residualScale(design, target, coefficients)
  let iterations = 0
  let converged = false
  while (iterations < maxIterations && !converged) {
    iterations++
    const residuals = residualsOf(design, target, coefficients)
    const threshold = huberTuning * scale
    weights = residuals.map((residual) => (Math.abs(residual) <= threshold ? 1 : threshold / Math.abs(residual)))
    const next = weightedLeastSquares(design, target, weights)
    converged = next.every((value, index) => Math.abs(value - coefficients[index]!) < COEFFICIENT_TOLERANCE)
    coefficients = next
    scale = residualScale(design, target, coefficients)
  }
  return { coefficients, weights, scale, iterations, converged }
}

function weightedLeastSquares(design: number[][], target: number[], weights: number[]): number[] {
  const rootWeights = weights.map(Math.sqrt)
  const left = new Matrix(design.map((row, index) => row.map((value) => value * rootWeights[index]!)))
  const right = Matrix.columnVector(target.map((value, index) => value * rootWeights[index]!))
  // SVD solve gives the minimum-norm answer even if weighting made the rows nearly dependent.
  return solve(left, right, true).getColumn(0)
}

function residualsOf(design: number[][], target: number[], coefficients: number[]): number[] {
  return design.map((row, index) => target[index]! - row.reduce((sum, value, column) => sum + value * coefficients[column]!, 0))
}

function residualScale(design: number[][], target: number[], coefficients: number[]): number {
  const absoluteResiduals = residualsOf(design, target, coefficients).map(Math.abs)
  return Math.max(RELATIVE_SCALE_FLOOR, MAD_TO_SIGMA * nearestRankPercentile(absoluteResiduals, 50))
}
