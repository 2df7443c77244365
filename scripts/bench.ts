// Benchmark: `npm run bench`. Generates a fold pattern of invented units and times the engine against a bare svgson parse.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { parseSync } from 'svgson'
import type { AnalysisParams, AnalysisStage } from '../server/analysis/index'
import { bundleForNode } from './lib/node-bundle'

const UNIT_MM = 12
const REPEATS = 5

/** Three decimals, as drawing programs write coordinates. */
function mm(value: number): string {
  return value.toFixed(3)
}

/**
 * One square folding unit at (x, y), written the way a drawing program
 * exports it (ids, absolute coordinates with three decimals, basic shapes):
 * four slits along the sides that stop short of the corners, each drawn as
 * two lines that chain; a pinch relief arc at each corner; a round relief
 * hole; a rounded slot; a tab outline of two cubic curves; a zig-zag hinge
 * polyline; and a score line across.
 */
function foldUnit(row: number, column: number): string {
  const x = column * UNIT_MM
  const y = row * UNIT_MM
  const id = `u${row}-${column}`
  const inset = 0.6
  const near = 1.2
  const far = UNIT_MM - near
  const middle = UNIT_MM / 2
  const line = (name: string, fromX: number, fromY: number, toX: number, toY: number) => `<path id="${id}-${name}" d="M${mm(x + fromX)} ${mm(y + fromY)}L${mm(x + toX)} ${mm(y + toY)}"/>`
  const corner = (name: string, cornerX: number, cornerY: number, sweep: number) =>
    `<path id="${id}-${name}" d="M${mm(x + cornerX)} ${mm(y + cornerY - 0.4)}A0.4 0.4 0 0 ${sweep} ${mm(x + cornerX + (sweep ? 0.4 : -0.4))} ${mm(y + cornerY)}"/>`
  const hinge = Array.from({ length: 9 }, (_, step) => `${mm(x + 3 + step * 0.75)},${mm(y + (step % 2 === 0 ? 8.4 : 9))}`).join(' ')
  return [
    `<g id="${id}">`,
    line('top-a', near, inset, middle, inset),
    line('top-b', middle, inset, far, inset),
    line('bottom-a', far, UNIT_MM - inset, middle, UNIT_MM - inset),
    line('bottom-b', middle, UNIT_MM - inset, near, UNIT_MM - inset),
    line('left', inset, near, inset, far),
    line('right', UNIT_MM - inset, far, UNIT_MM - inset, near),
    corner('pinch-a', 2, 2, 1),
    corner('pinch-b', far - 0.8, 2, 0),
    corner('pinch-c', 2, far - 0.8, 1),
    corner('pinch-d', far - 0.8, far - 0.8, 0),
    `<circle id="${id}-relief" cx="${mm(x + middle)}" cy="${mm(y + middle)}" r="1.000"/>`,
    `<rect id="${id}-slot" x="${mm(x + 7.5)}" y="${mm(y + 2.5)}" width="2.400" height="0.800" rx="0.400"/>`,
    `<path id="${id}-tab" d="M${mm(x + 2.5)} ${mm(y + 4)}C${mm(x + 2.5)} ${mm(y + 2.8)} ${mm(x + 5)} ${mm(y + 2.8)} ${mm(x + 5)} ${mm(y + 4)}C${mm(x + 5)} ${mm(y + 5.2)} ${mm(x + 2.5)} ${mm(y + 5.2)} ${mm(x + 2.5)} ${mm(y + 4)}Z"/>`,
    `<polyline id="${id}-hinge" points="${hinge}"/>`,
    `<path id="${id}-fold" class="fold" d="M${mm(x + near)} ${mm(y + near)}L${mm(x + far)} ${mm(y + far)}"/>`,
    '</g>',
  ].join('')
}

function foldPattern(unitsAcross: number, unitsDown: number): string {
  const units: string[] = []
  for (let row = 0; row < unitsDown; row++) {
    for (let column = 0; column < unitsAcross; column++) units.push(foldUnit(row, column))
  }
  const widthMm = unitsAcross * UNIT_MM
  const heightMm = unitsDown * UNIT_MM
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${widthMm}mm" height="${heightMm}mm" viewBox="0 0 ${widthMm} ${heightMm}">
<style>.fold { stroke: #00897b }</style>
<g fill="none" stroke="#c2185b" stroke-width="0.1"><path id="outline" d="M0 0H${widthMm}V${heightMm}H0Z"/>
${units.join('\n')}
</g></svg>`
}

interface Figures {
  megabytes: number
  contours: number
  groups: number
  sites: number
  engineMs: number
  parseMs: number
  /** Stage times of the fastest engine run. */
  stageMs: Partial<Record<AnalysisStage, number>>
}

// The engine as the server runs it: bundled by esbuild like the analysis worker (tsx would time its own wrappers too).
const bundleDirectory = mkdtempSync(join(tmpdir(), 'kerfbook-bench-'))
const bundleFile = join(bundleDirectory, 'engine.mjs')
await bundleForNode(resolve('server/analysis/index.ts'), bundleFile)
const engine: typeof import('../server/analysis/index') = await import(pathToFileURL(bundleFile).href)
rmSync(bundleDirectory, { recursive: true, force: true })

const LARGE_SHEET = { sheetWidthMm: 2000, sheetHeightMm: 2000, bedWidthMm: 2000, bedHeightMm: 2000 }
/**
 * The process the pattern is drawn for: 0.6 mm card on a laser. The kerf is
 * from memory of typical CO2 laser cuts in card (about 0.1 mm); the minimum
 * bridge and hole follow the engine's common-practice rule (half the
 * thickness, the thickness). At this scale the pattern passes its checks.
 */
const CARD_PROCESS: AnalysisParams = engine.withDefaults({ ...LARGE_SHEET, thicknessMm: 0.6, kerfMm: 0.1 })
/** The default profile (3 mm): far too thick for 12 mm units, so every unit has about twenty narrow bridges, a stress case for the checks. */
const THICK_PROCESS: AnalysisParams = { ...engine.DEFAULT_ANALYSIS_PARAMS, ...LARGE_SHEET }

/**
 * Fastest of a few runs of each; engine and parse runs alternate, so a busy
 * machine slows both alike rather than whichever ran during the busy spell.
 */
function measure(unitsAcross: number, unitsDown: number, params: AnalysisParams): Figures {
  const svg = foldPattern(unitsAcross, unitsDown)
  const figures: Figures = { megabytes: svg.length / 1e6, contours: 0, groups: 0, sites: 0, engineMs: Infinity, parseMs: Infinity, stageMs: {} }
  for (let attempt = 0; attempt < REPEATS; attempt++) {
    const stages: Figures['stageMs'] = {}
    const engineStarted = performance.now()
    const result = engine.analyzeSvg(svg, params, { onStageTimed: (stage, elapsedMs) => (stages[stage] = elapsedMs) })
    const engineMs = performance.now() - engineStarted
    figures.contours = result.cut.pierces
    figures.groups = result.findingGroups.length
    figures.sites = result.sites.count
    if (engineMs < figures.engineMs) {
      figures.engineMs = engineMs
      figures.stageMs = stages
    }
    const parseStarted = performance.now()
    parseSync(svg)
    figures.parseMs = Math.min(figures.parseMs, performance.now() - parseStarted)
  }
  return figures
}

function report(label: string, figures: Figures): void {
  console.log(
    `${label.padEnd(16)} ${figures.megabytes.toFixed(2)} MB  ${figures.contours} cut contours  ${figures.groups} finding groups of ${figures.sites} sites  engine ${figures.engineMs.toFixed(0)} ms  svgson parse ${figures.parseMs.toFixed(0)} ms  ratio ${(figures.engineMs / figures.parseMs).toFixed(2)}×`,
  )
  const stages = Object.entries(figures.stageMs).map(([stage, elapsedMs]) => `${stage} ${elapsedMs.toFixed(0)}`)
  console.log(`${''.padEnd(16)} stages (ms): ${stages.join(', ')}`)
}

function compare(title: string, params: AnalysisParams): void {
  const base = measure(60, 60, params)
  const doubled = measure(60, 120, params)
  console.log(title)
  report('60 × 60 units', base)
  report('60 × 120 units', doubled)
  console.log(`${''.padEnd(16)} doubling the pattern: engine time × ${(doubled.engineMs / base.engineMs).toFixed(2)}`)
}

// Warm up the JIT on a small pattern so the first timing is not a compile.
measure(10, 10, CARD_PROCESS)
measure(10, 10, THICK_PROCESS)
compare('0.6 mm card, the process the pattern is drawn for (targets: ratio ≤ 3, doubling ≤ 2.3):', CARD_PROCESS)
compare('3 mm default profile, every unit full of narrow bridges (the checks under stress):', THICK_PROCESS)
