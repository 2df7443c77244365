// Benchmark: `npm run bench`. Generates a fold pattern of invented units and times the engine against a bare svgson parse.
import { parseSync } from 'svgson'
import { analyzeSvg, DEFAULT_ANALYSIS_PARAMS } from '../server/analysis/index'

const UNIT_MM = 12
const REPEATS = 3

/**
 * A sheet of square folding units: each unit has four slits along its sides
 * that stop short of the corners (leaving pinch bridges), each slit drawn as
 * two lines that chain, a small corner relief arc and a score line across.
 */
function foldPattern(unitsAcross: number, unitsDown: number): string {
  const parts: string[] = []
  const bridgeMm = 1.2
  for (let row = 0; row < unitsDown; row++) {
    for (let column = 0; column < unitsAcross; column++) {
      const x = column * UNIT_MM
      const y = row * UNIT_MM
      const near = bridgeMm
      const far = UNIT_MM - bridgeMm
      const middle = UNIT_MM / 2
      parts.push(
        `<g transform="translate(${x} ${y})">`,
        `<path d="M${near} 0.6H${middle}"/><path d="M${middle} 0.6H${far}"/>`,
        `<path d="M${far} ${UNIT_MM - 0.6}H${middle}"/><path d="M${middle} ${UNIT_MM - 0.6}H${near}"/>`,
        `<path d="M0.6 ${near}V${far}"/><path d="M${UNIT_MM - 0.6} ${far}V${near}"/>`,
        `<path d="M${middle - 1} ${middle}a1 1 0 1 1 2 0a1 1 0 1 1 -2 0z"/>`,
        `<path class="fold" d="M${near} ${near}L${far} ${far}"/>`,
        '</g>',
      )
    }
  }
  const widthMm = unitsAcross * UNIT_MM
  const heightMm = unitsDown * UNIT_MM
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${widthMm}mm" height="${heightMm}mm" viewBox="0 0 ${widthMm} ${heightMm}">
<style>.fold { stroke: #00897b }</style>
<g fill="none" stroke="#c2185b"><path d="M0 0H${widthMm}V${heightMm}H0Z"/>
${parts.join('\n')}
</g></svg>`
}

function fastestMs(run: () => void): number {
  let best = Infinity
  for (let attempt = 0; attempt < REPEATS; attempt++) {
    const started = performance.now()
    run()
    best = Math.min(best, performance.now() - started)
  }
  return best
}

function measure(unitsAcross: number, unitsDown: number): { engineMs: number; parseMs: number; megabytes: number } {
  const svg = foldPattern(unitsAcross, unitsDown)
  const params = { ...DEFAULT_ANALYSIS_PARAMS, sheetWidthMm: 2000, sheetHeightMm: 2000, bedWidthMm: 2000, bedHeightMm: 2000 }
  const engineMs = fastestMs(() => analyzeSvg(svg, params))
  const parseMs = fastestMs(() => parseSync(svg))
  return { engineMs, parseMs, megabytes: svg.length / 1e6 }
}

// Warm up the JIT on a small pattern so the first timing is not a compile.
measure(10, 10)
const base = measure(60, 60)
const doubled = measure(60, 120)
const line = (label: string, figures: ReturnType<typeof measure>) =>
  `${label.padEnd(16)} ${figures.megabytes.toFixed(2)} MB  engine ${figures.engineMs.toFixed(0)} ms  svgson parse ${figures.parseMs.toFixed(0)} ms  ratio ${(figures.engineMs / figures.parseMs).toFixed(2)}×`
console.log(line('60 × 60 units', base))
console.log(line('60 × 120 units', doubled))
console.log(`doubling the pattern: engine time × ${(doubled.engineMs / base.engineMs).toFixed(2)} (target ≤ 2.3), engine/parse targets ≤ 3`)
