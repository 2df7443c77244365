// Command-line analysis of one SVG or DXF cut pattern: `npm run analyze -- FILE.svg|FILE.dxf [--json] [options]`.
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { migrateLatest, openDatabase } from '../db/index'
import { demoColours, demoDxfLayers } from '../db/seeds/demo-catalog'
import { analysisParamsFor } from '../server/services/analysis-profile'
import { describeGroup, describeSite, formatRangeMm } from '../shared/finding-messages'
import { AnalysisInputError, type AnalysisParams, type AnalysisResult, analyzeCutFile, type ColourRule, DEFAULT_ANALYSIS_PARAMS, type DxfLayerRule, withDefaults } from '../server/analysis/index'

const NUMBER_OPTIONS = {
  speed: 'cutSpeedMmPerMin',
  accel: 'accelMmPerS2',
  rapid: 'rapidSpeedMmPerMin',
  'pierce-s': 'pierceTimeS',
  kerf: 'kerfMm',
  thickness: 'thicknessMm',
  'min-bridge': 'minBridgeMm',
  'min-hole': 'minHoleMm',
  margin: 'marginMm',
  dpi: 'dpi',
} as const satisfies Record<string, keyof AnalysisParams>

/**
 * The profile without --cutter/--material: the engine's demo laser, with the demo workshop's colours and layers
 * (the ones the README's demo day draws with) before the engine's own, so a file made for the demo is read as it
 * would be on the server. Minimum bridge and hole follow --thickness unless given (withDefaults).
 */
const DEMO_COLOUR_MAPPING: ColourRule[] = [
  ...demoColours.map((colour) => ({ hex: colour.hex, toleranceRgbDistance: colour.tolerance, operation: colour.operation as ColourRule['operation'] })),
  ...DEFAULT_ANALYSIS_PARAMS.colourMapping,
]
const DEMO_LAYER_MAPPING: DxfLayerRule[] = demoDxfLayers.map((layer) => ({ layer: layer.layer, operation: layer.operation as DxfLayerRule['operation'] }))
const defaultProfile = (overrides: Partial<AnalysisParams>) =>
  withDefaults({ colourMapping: DEMO_COLOUR_MAPPING, dxfLayerMapping: DEMO_LAYER_MAPPING, ...overrides })

const HELP = `Usage: npm run analyze -- FILE.svg|FILE.dxf [--json] [options]

Measures an SVG or ASCII DXF cut pattern (the content, not the name, tells which) and estimates machine time and sheet fit (prices are the server's).
Findings are printed as groups (one per kind, cause and limit) with their count, range and first sites.
With --json, prints exactly the result JSON on stdout (the site table's typed arrays as plain arrays).

Options (each overrides the default profile shown in brackets):
  --speed MM_PER_MIN    cut speed [${DEFAULT_ANALYSIS_PARAMS.cutSpeedMmPerMin}]
  --accel MM_PER_S2     acceleration, 0 = no limit [${DEFAULT_ANALYSIS_PARAMS.accelMmPerS2}]
  --rapid MM_PER_MIN    rapid travel speed [${DEFAULT_ANALYSIS_PARAMS.rapidSpeedMmPerMin}]
  --pierce-s S          time per pierce [${DEFAULT_ANALYSIS_PARAMS.pierceTimeS}]
  --kerf MM             kerf width [${DEFAULT_ANALYSIS_PARAMS.kerfMm}]
  --thickness MM        material thickness [${DEFAULT_ANALYSIS_PARAMS.thicknessMm}]; moves the minimum bridge
                        and hole below to half the thickness and the thickness unless they are given
                        (with --cutter/--material they are the process setting's and stay)
  --min-bridge MM       minimum bridge [${DEFAULT_ANALYSIS_PARAMS.minBridgeMm}]
  --min-hole MM         minimum hole [${DEFAULT_ANALYSIS_PARAMS.minHoleMm}]
  --sheet WxH           stock sheet in mm [${DEFAULT_ANALYSIS_PARAMS.sheetWidthMm}x${DEFAULT_ANALYSIS_PARAMS.sheetHeightMm}]
  --margin MM           edge margin [${DEFAULT_ANALYSIS_PARAMS.marginMm}]
  --dpi N               pixels per inch for px sizes [${DEFAULT_ANALYSIS_PARAMS.dpi}]
  --cutter ID --material ID   take the profile from the workshop's catalog (needs the database)

Default profile (an invented demo laser, not a recommendation; colours and DXF layers are the demo workshop's,
then the engine's own):
${JSON.stringify(defaultProfile({}), null, 2)}
`

async function main(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: {
      json: { type: 'boolean' },
      help: { type: 'boolean', short: 'h' },
      sheet: { type: 'string' },
      cutter: { type: 'string' },
      material: { type: 'string' },
      ...Object.fromEntries(Object.keys(NUMBER_OPTIONS).map((name) => [name, { type: 'string' as const }])),
    },
  })
  if (values.help || positionals.length !== 1) {
    process.stdout.write(HELP)
    return values.help ? 0 : 2
  }
  if ((values.cutter === undefined) !== (values.material === undefined)) {
    process.stderr.write('Give both --cutter ID and --material ID (ids as listed on the catalog pages).\n')
    return 2
  }
  const overrides = overridesFrom(values as Record<string, string | undefined>)
  const params =
    values.cutter !== undefined ? { ...(await catalogProfile(Number(values.cutter), Number(values.material))), ...overrides } : defaultProfile(overrides)
  try {
    const result = analyzeCutFile(readFileSync(positionals[0]!, 'utf8'), params)
    process.stdout.write(values.json ? `${JSON.stringify(result, (_key, value: unknown) => (ArrayBuffer.isView(value) ? Array.from(value as Float32Array) : value))}\n` : readableReport(result))
    return 0
  } catch (error) {
    if (!(error instanceof AnalysisInputError)) throw error
    process.stderr.write(`${error.message}\n`)
    return 1
  }
}

/** The profile the server would use for this cutter × material, read from DATABASE_PATH. */
async function catalogProfile(cutterId: number, materialId: number): Promise<AnalysisParams> {
  const db = openDatabase()
  try {
    await migrateLatest(db)
    return await analysisParamsFor(db, { cutterId, materialId })
  } finally {
    await db.destroy()
  }
}

function overridesFrom(values: Record<string, string | undefined>): Partial<AnalysisParams> {
  const overrides: Partial<Record<(typeof NUMBER_OPTIONS)[keyof typeof NUMBER_OPTIONS] | 'sheetWidthMm' | 'sheetHeightMm', number>> = {}
  for (const [option, field] of Object.entries(NUMBER_OPTIONS)) {
    if (values[option] !== undefined) overrides[field] = optionNumber(option, values[option])
  }
  if (values.sheet !== undefined) {
    const match = /^(\d+(?:\.\d+)?)x(\d+(?:\.\d+)?)$/i.exec(values.sheet)
    if (!match) throw new Error(`--sheet wants WIDTHxHEIGHT in mm, e.g. 600x400 (got "${values.sheet}")`)
    overrides.sheetWidthMm = Number(match[1])
    overrides.sheetHeightMm = Number(match[2])
  }
  return overrides
}

function optionNumber(option: string, text: string): number {
  const number = Number(text)
  if (text.trim() === '' || !Number.isFinite(number) || number < 0) throw new Error(`--${option} wants a number of zero or more (got "${text}")`)
  return number
}

function readableReport(result: AnalysisResult): string {
  const rows: Array<[string, string]> = [
    ['Bounding box', `${mm(result.bbox.width)} × ${mm(result.bbox.height)} at (${mm(result.bbox.x)}, ${mm(result.bbox.y)})`],
    ['Cut length', `${mm(result.cut.lengthMm)} in ${result.cut.closedContours} closed and ${result.cut.openContours} open contours`],
    ['Pierces', String(result.cut.pierces)],
    ['Score length', mm(result.score.lengthMm)],
    ['Engrave area', `${result.engrave.areaMm2.toFixed(1)} mm²`],
    ['Travel', mm(result.travelMm)],
    ['Time', `${seconds(result.time.totalS)} (cut ${seconds(result.time.cutS)}, score ${seconds(result.time.scoreS)}, engrave ${seconds(result.time.engraveS)}, pierce ${seconds(result.time.pierceS)}, travel ${seconds(result.time.travelS)}, setup ${seconds(result.time.setupS)})`],
    ['Sheet', result.sheet.fits ? `fits${result.sheet.rotated ? ' turned 90°' : ''}, ${result.sheet.copies} per sheet` : 'does not fit'],
  ]
  const width = Math.max(...rows.map(([label]) => label.length))
  const findings = result.findingGroups.flatMap((group) => groupLines(result, group))
  return `${rows.map(([label, value]) => `${label.padEnd(width)}  ${value}`).join('\n')}\n${findings.length ? `Findings:\n${findings.join('\n')}\n` : 'No findings.\n'}`
}

// The first few sites of a group, worst first; the rest are counted.
const SITES_SHOWN = 3

function groupLines(result: AnalysisResult, group: AnalysisResult['findingGroups'][number]): string[] {
  const { title, headline, advice } = describeGroup(group)
  const { sites } = result
  const lines = [`  ${group.severity.padEnd(7)} ${title} [${group.key}]: ${headline}. ${advice}`]
  if (group.stats) lines.push(`          median ${mm(group.stats.median)}, histogram ${formatRangeMm(group.stats.histogram.fromMm, group.stats.histogram.toMm)}: ${group.stats.histogram.counts.join(' ')}`)
  for (let row = group.firstSite; row < group.firstSite + Math.min(group.count, SITES_SHOWN); row++) {
    // The group's sites are rows firstSite … firstSite + count - 1 of the packed arrays.
    const line = describeSite(group, sites.value[row]!)
    lines.push(`          at (${mm(sites.xy[2 * row]!)}, ${mm(sites.xy[2 * row + 1]!)})${line ? `: ${line}` : ''}`)
  }
  if (group.count > SITES_SHOWN) lines.push(`          … and ${group.count - SITES_SHOWN} more`)
  return lines
}

function mm(value: number): string {
  return `${value.toFixed(2)} mm`
}

function seconds(value: number): string {
  return `${value.toFixed(1)} s`
}

main(process.argv.slice(2)).then(
  (code) => (process.exitCode = code),
  (error: unknown) => {
    process.stderr.write(`${error instanceof Error ? error.message : String(error)}\n`)
    process.exitCode = 2
  },
)
