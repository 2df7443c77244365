// Benchmark: `npm run bench`. Generates fold patterns of invented units, times the engine against a bare svgson parse and sizes what is stored.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { gzipSync } from 'node:zlib'
import { parseSync } from 'svgson'
import type { AnalysisParams, AnalysisStage } from '../server/analysis/index'
import { encodeGeometry, encodeSites } from '../shared/packed-analysis'
import { foldSheet } from './lib/fold-sheet'
import { bundleForNode } from './lib/node-bundle'
import { seededRandom } from './lib/seeded-random'

const UNIT_MM = 12
const REPEATS = 5

/** A pattern's way of writing numbers and of varying each unit. */
interface Drawing {
  /** Coordinates as the drawing program writes them. */
  mm: (value: number) => string
  /** A small change for each curve and slit (0 for a repeating pattern). */
  nudge: () => number
}

/** Three decimals, as drawing programs write coordinates; every unit alike. */
const REPEATING: Drawing = { mm: (value) => value.toFixed(3), nudge: () => 0 }

/**
 * Every unit different: each slit end, radius, control point and hinge
 * vertex moved by up to ±0.03 mm in steps of 0.00001 mm (6 001 values, so
 * the units' curves hardly ever share a shape), written with five decimals.
 * A fixed seed draws the same pattern every run.
 */
function nonRepeating(seed: number): Drawing {
  const random = seededRandom(seed)
  return { mm: (value) => value.toFixed(5), nudge: () => Math.round((random() - 0.5) * 6000) / 100000 }
}

/**
 * One square folding unit at (x, y), written the way a drawing program
 * exports it (ids, absolute coordinates, basic shapes): four slits along the
 * sides that stop short of the corners, each drawn as two lines that chain;
 * a pinch relief arc at each corner; a round relief hole; a rounded slot; a
 * tab outline of two cubic curves; a zig-zag hinge polyline; and a score
 * line across.
 */
function foldUnit(row: number, column: number, { mm, nudge }: Drawing): string {
  const x = column * UNIT_MM
  const y = row * UNIT_MM
  const id = `u${row}-${column}`
  const inset = 0.6
  const near = 1.2
  const far = UNIT_MM - near
  const middle = UNIT_MM / 2
  const line = (name: string, fromX: number, fromY: number, toX: number, toY: number) => `<path id="${id}-${name}" d="M${mm(x + fromX)} ${mm(y + fromY)}L${mm(x + toX)} ${mm(y + toY)}"/>`
  const corner = (name: string, cornerX: number, cornerY: number, sweep: number) => {
    const radius = 0.4 + nudge()
    // Written as short as the repeating pattern always was.
    const radiusText = radius === 0.4 ? '0.4' : mm(radius)
    return `<path id="${id}-${name}" d="M${mm(x + cornerX)} ${mm(y + cornerY - radius)}A${radiusText} ${radiusText} 0 0 ${sweep} ${mm(x + cornerX + (sweep ? radius : -radius))} ${mm(y + cornerY)}"/>`
  }
  const hinge = Array.from({ length: 9 }, (_, step) => `${mm(x + 3 + step * 0.75 + nudge())},${mm(y + (step % 2 === 0 ? 8.4 : 9) + nudge())}`).join(' ')
  const tabTop = 2.8 + nudge()
  const tabBottom = 5.2 + nudge()
  const slitEnd = () => near + nudge()
  return [
    `<g id="${id}">`,
    line('top-a', slitEnd(), inset, middle, inset),
    line('top-b', middle, inset, UNIT_MM - slitEnd(), inset),
    line('bottom-a', UNIT_MM - slitEnd(), UNIT_MM - inset, middle, UNIT_MM - inset),
    line('bottom-b', middle, UNIT_MM - inset, slitEnd(), UNIT_MM - inset),
    line('left', inset, slitEnd(), inset, UNIT_MM - slitEnd()),
    line('right', UNIT_MM - inset, UNIT_MM - slitEnd(), UNIT_MM - inset, slitEnd()),
    corner('pinch-a', 2, 2, 1),
    corner('pinch-b', far - 0.8, 2, 0),
    corner('pinch-c', 2, far - 0.8, 1),
    corner('pinch-d', far - 0.8, far - 0.8, 0),
    `<circle id="${id}-relief" cx="${mm(x + middle)}" cy="${mm(y + middle)}" r="${mm(1 + nudge())}"/>`,
    `<rect id="${id}-slot" x="${mm(x + 7.5)}" y="${mm(y + 2.5)}" width="${mm(2.4 + nudge())}" height="0.800" rx="${mm(0.4 + nudge() / 3)}"/>`,
    `<path id="${id}-tab" d="M${mm(x + 2.5)} ${mm(y + 4)}C${mm(x + 2.5)} ${mm(y + tabTop)} ${mm(x + 5)} ${mm(y + tabTop)} ${mm(x + 5)} ${mm(y + 4)}C${mm(x + 5)} ${mm(y + tabBottom)} ${mm(x + 2.5)} ${mm(y + tabBottom)} ${mm(x + 2.5)} ${mm(y + 4)}Z"/>`,
    `<polyline id="${id}-hinge" points="${hinge}"/>`,
    `<path id="${id}-fold" class="fold" d="M${mm(x + near)} ${mm(y + near)}L${mm(x + far)} ${mm(y + far)}"/>`,
    '</g>',
  ].join('')
}

function foldPattern(unitsAcross: number, unitsDown: number, drawing: Drawing = REPEATING): string {
  const units: string[] = []
  for (let row = 0; row < unitsDown; row++) {
    for (let column = 0; column < unitsAcross; column++) units.push(foldUnit(row, column, drawing))
  }
  const widthMm = unitsAcross * UNIT_MM
  const heightMm = unitsDown * UNIT_MM
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${widthMm}mm" height="${heightMm}mm" viewBox="0 0 ${widthMm} ${heightMm}">
<style>.fold { stroke: #00897b }</style>
<g fill="none" stroke="#c2185b" stroke-width="0.1"><path id="outline" d="M0 0H${widthMm}V${heightMm}H0Z"/>
${units.join('\n')}
</g></svg>`
}

/**
 * A pinch-hinge sheet as members upload it: 12 mm units, each with four
 * slits 1 mm in from its sides that stop 2 mm short of its corners, so at
 * every corner two slit ends leave a hinge 1.41 mm across between centre
 * lines (narrow by design on 3 mm material), and a 4 mm relief hole in the
 * middle; neighbouring units' slits are 2 mm apart. 150 × 150 units:
 * 22 500 units, 112 501 contours, about 6.7 MB.
 */
function pinchHingeSheet(unitsAcross: number, unitsDown: number): string {
  const { mm } = REPEATING
  const units: string[] = []
  for (let row = 0; row < unitsDown; row++) {
    for (let column = 0; column < unitsAcross; column++) {
      const x = column * UNIT_MM
      const y = row * UNIT_MM
      const id = `h${row}-${column}`
      const slit = (name: string, fromX: number, fromY: number, toX: number, toY: number) => `<path id="${id}-${name}" d="M${mm(x + fromX)} ${mm(y + fromY)}L${mm(x + toX)} ${mm(y + toY)}"/>`
      units.push(`${slit('t', 2, 1, 10, 1)}${slit('r', 11, 2, 11, 10)}${slit('b', 10, 11, 2, 11)}${slit('l', 1, 10, 1, 2)}<circle id="${id}-c" cx="${mm(x + 6)}" cy="${mm(y + 6)}" r="2"/>`)
    }
  }
  const widthMm = unitsAcross * UNIT_MM
  const heightMm = unitsDown * UNIT_MM
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${widthMm + 4}mm" height="${heightMm + 4}mm" viewBox="-2 -2 ${widthMm + 4} ${heightMm + 4}">
<g fill="none" stroke="#c2185b" stroke-width="0.1"><path id="outline" d="M-2 -2H${widthMm + 2}V${heightMm + 2}H-2Z"/>
${units.join('\n')}
</g></svg>`
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
/** The default profile (3 mm plywood): far too thick for the fold pattern's 12 mm units, so every unit has about twenty narrow bridges, a stress case for the checks. */
const THICK_PROCESS: AnalysisParams = { ...engine.DEFAULT_ANALYSIS_PARAMS, ...LARGE_SHEET }

interface Figures {
  megabytes: number
  contours: number
  groups: number
  sites: number
  engineMs: number
  parseMs: number
  /** Stage times of the fastest engine run. */
  stageMs: Partial<Record<AnalysisStage, number>>
  /** What is stored: the result's JSON without the sites, and the packed sites and preview geometry gzip-compressed (level 6). */
  jsonBytes: number
  sitesGzipBytes: number
  geometryGzipBytes: number
}

/**
 * Fastest of a few runs of each; engine and parse runs alternate, so a busy
 * machine slows both alike rather than whichever ran during the busy spell.
 */
function measure(svg: string, params: AnalysisParams, repeats = REPEATS): Figures {
  const figures: Figures = {
    megabytes: svg.length / 1e6,
    contours: 0,
    groups: 0,
    sites: 0,
    engineMs: Infinity,
    parseMs: Infinity,
    stageMs: {},
    jsonBytes: 0,
    sitesGzipBytes: 0,
    geometryGzipBytes: 0,
  }
  for (let attempt = 0; attempt < repeats; attempt++) {
    const stages: Figures['stageMs'] = {}
    const engineStarted = performance.now()
    const { result, geometry } = engine.analyzeSvgWithGeometry(svg, params, { onStageTimed: (stage, elapsedMs) => (stages[stage] = elapsedMs) })
    const engineMs = performance.now() - engineStarted
    if (attempt === 0) {
      const { sites, ...stored } = result
      figures.contours = result.cut.pierces
      figures.groups = result.findingGroups.length
      figures.sites = sites.count
      figures.jsonBytes = Buffer.byteLength(JSON.stringify(stored))
      figures.sitesGzipBytes = gzipSync(encodeSites(sites), { level: 6 }).length
      figures.geometryGzipBytes = gzipSync(encodeGeometry(geometry.contours), { level: 6 }).length
    }
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

const kilobytes = (bytes: number) => `${(bytes / 1024).toFixed(0)} kB`
const INDENT = ''.padEnd(22)

function report(label: string, figures: Figures): void {
  console.log(
    `${label.padEnd(22)} ${figures.megabytes.toFixed(2)} MB  ${figures.contours} cut contours  engine ${figures.engineMs.toFixed(0)} ms  svgson parse ${figures.parseMs.toFixed(0)} ms  ratio ${(figures.engineMs / figures.parseMs).toFixed(2)}×`,
  )
  const stages = Object.entries(figures.stageMs).map(([stage, elapsedMs]) => `${stage} ${elapsedMs.toFixed(0)}`)
  console.log(`${INDENT} stages (ms): ${stages.join(', ')}`)
  console.log(
    `${INDENT} ${figures.groups} finding groups, ${figures.sites} sites; stored: JSON without sites ${kilobytes(figures.jsonBytes)} + sites gz ${kilobytes(figures.sitesGzipBytes)} = ${kilobytes(figures.jsonBytes + figures.sitesGzipBytes)}; preview geometry gz ${kilobytes(figures.geometryGzipBytes)}`,
  )
}

function compare(title: string, params: AnalysisParams): void {
  const base = measure(foldPattern(60, 60), params)
  const doubled = measure(foldPattern(60, 120), params)
  console.log(title)
  report('60 × 60 units', base)
  report('60 × 120 units', doubled)
  console.log(`${INDENT} doubling the pattern: engine time × ${(doubled.engineMs / base.engineMs).toFixed(2)}`)
}

// Warm up the JIT on a small pattern so the first timing is not a compile.
measure(foldPattern(10, 10), CARD_PROCESS)
measure(foldPattern(10, 10), THICK_PROCESS)
compare('0.6 mm card, the process the pattern is drawn for (targets: ratio ≤ 2, doubling ≤ 2.3):', CARD_PROCESS)
compare('3 mm default profile, every unit full of narrow bridges (the checks under stress):', THICK_PROCESS)
console.log('Non-repeating fold pattern, every slit and curve of every unit slightly different (target: ratio ≤ 2):')
const nonRepeatingPattern = foldPattern(60, 60, nonRepeating(20261204))
report('card, 60 × 60 units', measure(nonRepeatingPattern, CARD_PROCESS))
report('3 mm, 60 × 60 units', measure(nonRepeatingPattern, THICK_PROCESS))
console.log('Findings-heavy: a pinch-hinge sheet on 3 mm plywood, every hinge narrow by design (target: JSON + sites gz ≤ 2 MB):')
report('150 × 150 units', measure(pinchHingeSheet(150, 150), THICK_PROCESS))
console.log('The bench:fold sheet (20 mm panels, every hinge 1.5 mm after the kerf) on 3 mm plywood, as drawn and with every unit jittered (target: ratio ≤ 2):')
report('150 × 150 units', measure(foldSheet({ unitsAcross: 150, unitsDown: 150, cutColour: '#c2185b' }).svg, THICK_PROCESS))
report('non-repeating', measure(foldSheet({ unitsAcross: 150, unitsDown: 150, cutColour: '#c2185b', jitterSeed: 20261204 }).svg, THICK_PROCESS))
