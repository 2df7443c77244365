// What a member reads about a finding group: made at display time from the group's code, cause, count,
// statistics and facts (the engine stores numbers, never sentences), so one wording serves every page.
// Lengths arrive in mm and are given in the reader's unit (shared/units.ts); the default is mm.
import type { FindingGroup } from './finding-groups'
import { MM_PER_INCH, type LengthUnit } from './units'

export const FINDING_TITLES: Record<string, string> = {
  'narrow-bridge': 'Bridge too narrow',
  'merged-cuts': 'Cuts run into each other',
  'small-hole': 'Hole too small',
  'duplicate-cut': 'Cut twice',
  'open-contour': 'Open line',
  'tiny-segment': 'Tiny segment',
  'self-intersection': 'Line crosses itself',
  'outside-sheet': 'Outside the sheet',
  'text-not-outlined': 'Text not converted to paths',
  'raster-image': 'Picture in the file',
  'unmapped-colour': 'Unknown line colour',
  'material-not-allowed': 'Material not allowed',
  'too-thick': 'Material too thick',
  'dxf-units-assumed': 'Drawing units not stated',
  'dxf-dimension': 'Dimensions in the file',
  'dxf-hatch': 'Hatch fill in the file',
  'dxf-entity-not-read': 'Drawing element not read',
  'dxf-spline-fit-points': 'Curve given by fit points',
  'dxf-not-planar': 'Drawn outside the flat plane',
}

export function findingTitle(code: string): string {
  return FINDING_TITLES[code] ?? code
}

export interface GroupDescription {
  title: string
  /** One sentence: how many, what, and the measured range against the limit. */
  headline: string
  /** What it means and what to do. */
  advice: string
}

type Described = Pick<FindingGroup, 'code' | 'cause' | 'count' | 'facts' | 'stats'>

/**
 * The digits of a measured length in the reader's unit, fixed so that ranges and limits line up: hundredths of
 * a millimetre, or thousandths of an inch (a thou, 0.0254 mm). Without the unit, so a range names it once.
 */
function measuredDigits(valueMm: number, unit: LengthUnit): string {
  return unit === 'in' ? (valueMm / MM_PER_INCH).toFixed(3) : valueMm.toFixed(2)
}

/** A measured length as members read it: "1.50 mm", or "0.059 in". */
export function formatMeasure(valueMm: number, unit: LengthUnit = 'mm'): string {
  return `${measuredDigits(valueMm, unit)} ${unit}`
}

/** A count with its thousands set apart by a no-break space (22 500). */
export function formatCount(count: number): string {
  return String(Math.round(count)).replace(/\B(?=(\d{3})+(?!\d))/g, '\u00a0')
}

/** "1.50–1.62 mm" ("0.059–0.064 in"), or one length when both ends read the same. */
export function formatRangeMm(fromMm: number, toMm: number, unit: LengthUnit = 'mm'): string {
  const from = measuredDigits(fromMm, unit)
  const to = measuredDigits(toMm, unit)
  return from === to ? `${from} ${unit}` : `${from}–${to} ${unit}`
}

/** "1 bridge", "22 500 bridges". */
function counted(count: number, singular: string, plural: string): string {
  return `${formatCount(count)} ${count === 1 ? singular : plural}`
}

const isOrAre = (count: number) => (count === 1 ? 'is' : 'are')

/** Message, headline and advice of a group in plain words, from its facts, with lengths in `unit`. */
export function describeGroup(group: Described, unit: LengthUnit = 'mm'): GroupDescription {
  const title = findingTitle(group.code)
  // Revisions stored before findings were grouped keep their first finding's sentence instead of the numbers (db/legacy).
  if (typeof group.facts.message === 'string') return { title, headline: `${counted(group.count, 'place', 'places')}: ${group.facts.message}`, advice: '' }
  const words = WORDING[group.code]?.(group, new Facts(group, unit)) ?? { headline: `${formatCount(group.count)} × ${title}`, advice: '' }
  return { title, ...words }
}

/** The line for one site of a group: its measured value (mm) in the group's terms and in `unit`, or '' when the site has none (no words that are not a number). */
export function describeSite(group: Pick<FindingGroup, 'code' | 'cause' | 'facts'>, value: number, unit: LengthUnit = 'mm'): string {
  if (!Number.isFinite(value)) return ''
  const facts = new Facts(group, unit)
  if (typeof group.facts.message === 'string') return facts.length(value)
  switch (group.code) {
    case 'narrow-bridge':
      return value <= 0 ? `${facts.length(value + facts.number('kerfMm'))} apart (kerf ${facts.mm('kerfMm')})` : `${facts.length(value)} wide (limit ${facts.mm('limitMm')})`
    case 'merged-cuts':
      return `${facts.length(Math.max(0, value + facts.number('kerfMm')))} apart (kerf ${facts.mm('kerfMm')})`
    case 'small-hole':
      return `${facts.length(value)} across (limit ${facts.mm('limitMm')})`
    case 'tiny-segment':
      return `${facts.length(value)} long (limit ${facts.mm('limitMm')})`
    case 'duplicate-cut':
      return `${facts.length(value)} drawn twice`
    case 'open-contour':
      return `ends ${facts.length(value)} apart`
    case 'outside-sheet':
      return `${facts.length(value)} (usable ${facts.mm('limitMm')})`
    case 'too-thick':
      return `${facts.length(value)} thick (limit ${facts.mm('limitMm')})`
    default:
      return facts.length(value)
  }
}

/** Reads a group's facts; a missing number reads NaN, so a wrong fact shows rather than hides. */
class Facts {
  constructor(
    private readonly group: Pick<FindingGroup, 'facts'>,
    readonly unit: LengthUnit,
  ) {}

  number(name: string): number {
    const value = this.group.facts[name]
    return typeof value === 'number' ? value : Number.NaN
  }

  /** A length fact (stored in mm), in the reader's unit. */
  mm(name: string): string {
    return this.length(this.number(name))
  }

  length(valueMm: number): string {
    return formatMeasure(valueMm, this.unit)
  }

  text(name: string): string {
    const value = this.group.facts[name]
    return value === undefined ? '' : String(value)
  }
}

type Wording = (group: Described, facts: Facts) => Omit<GroupDescription, 'title'>

/** The measured range of the group's values in the reader's unit, shifted (a web plus the kerf is the distance between the cuts). */
function range(group: Described, facts: Facts, shiftMm = 0): string {
  return group.stats ? formatRangeMm(group.stats.min + shiftMm, group.stats.max + shiftMm, facts.unit) : ''
}

const dxfOrSvg = (facts: Facts, svg: string, dxf: string) => (facts.text('format') === 'dxf' ? dxf : svg)

const WORDING: Record<string, Wording> = {
  'narrow-bridge': (group, facts) => {
    const { count } = group
    const what = group.cause === 'neck' ? counted(count, 'neck within one cut', 'necks within single cuts') : counted(count, 'bridge between cuts', 'bridges between cuts')
    if (facts.number('limitMm') === 0) {
      return {
        headline: `${what} ${count === 1 ? 'burns' : 'burn'} away: the cuts are ${range(group, facts, facts.number('kerfMm'))} apart, no more than the kerf (${facts.mm('kerfMm')})`,
        advice: `The material between them is cut away and the piece comes loose. Keep the cuts at least ${facts.length(facts.number('kerfMm') + facts.number('minBridgeMm'))} apart (kerf plus the minimum bridge).`,
      }
    }
    // A width below zero is no bridge at all: the two cuts' kerfs overlap by that much.
    const min = group.stats?.min ?? 0
    const max = group.stats?.max ?? 0
    const width =
      max < 0
        ? `${count === 1 ? 'is' : 'are'} not there: the cuts overlap by ${formatRangeMm(-max, -min, facts.unit)} after the kerf`
        : min < 0
          ? `${count === 1 ? 'is' : 'range'} from cuts overlapping by ${formatRangeMm(-min, -min, facts.unit)} to ${formatRangeMm(max, max, facts.unit)} wide after the kerf`
          : `${isOrAre(count)} ${range(group, facts)} wide after the kerf`
    return {
      headline: `${what} ${width} (limit ${facts.mm('limitMm')})`,
      advice: `The minimum bridge for ${facts.mm('thicknessMm')} material on this cutter is ${facts.mm('limitMm')}; narrower ones may tear or burn through. Move the cuts apart, or choose the thinner material the pattern may be drawn for.`,
    }
  },
  'merged-cuts': (group, facts) =>
    group.cause === 'touch'
      ? {
          headline: `${counted(group.count, 'pair', 'pairs')} of separate cuts cross or meet`,
          advice: 'The piece between them may drop out. Join them into one outline or move them apart.',
        }
      : {
          headline: `${counted(group.count, 'pair', 'pairs')} of separate cuts come ${range(group, facts, facts.number('kerfMm'))} apart, within the kerf (${facts.mm('kerfMm')})`,
          advice: 'After cutting they run into each other. Move them apart or join them into one outline.',
        },
  'self-intersection': (group) => ({
    headline: `${counted(group.count, 'cut crosses or touches itself', 'cuts cross or touch themselves')}`,
    advice: 'The machine follows them as drawn, but which piece drops out is unclear. Redraw each as one outline that does not cross.',
  }),
  'duplicate-cut': (group, facts) => ({
    headline: `${counted(group.count, 'line is', 'lines are')} drawn twice: ${facts.mm('lengthMm')} in all, about ${facts.number('seconds').toFixed(1)} s more cutting`,
    advice: `Lines within ${facts.mm('toleranceMm')} of each other are cut twice, which leaves burn marks. Delete the copies.`,
  }),
  'small-hole': (group, facts) => ({
    headline: `${counted(group.count, 'hole', 'holes')} ${isOrAre(group.count)} ${range(group, facts)} across (smallest for ${facts.mm('thicknessMm')} material: ${facts.mm('limitMm')})`,
    advice: 'Holes this small may come out misshapen or not cut through. Make them larger or leave them out.',
  }),
  'tiny-segment': (group, facts) => ({
    headline: `${counted(group.count, 'line is', 'lines are')} only ${range(group, facts)} long (under ${facts.mm('limitMm')}, twice the kerf)`,
    advice: 'Each burns a dot and costs a pierce. Delete them unless they are meant.',
  }),
  'open-contour': (group, facts) =>
    group.cause === 'nearly-closed'
      ? {
          headline: `${counted(group.count, 'outline is', 'outlines are')} open, ${group.count === 1 ? 'its' : 'their'} ends only ${range(group, facts)} apart`,
          advice: `An open outline is cut as a line and nothing drops out. Close it if it should be a shape (ends closer than ${facts.mm('chainToleranceMm')} are joined).`,
        }
      : {
          headline: `${counted(group.count, 'open cut', 'open cuts')} (slits)`,
          advice: 'Cut as lines; nothing drops out. That is usual for slits and fold patterns.',
        },
  'outside-sheet': (group, facts) => ({
    headline: `The drawing is ${facts.mm('drawingWidthMm')} × ${facts.mm('drawingHeightMm')}; ${group.cause === 'beyond-bed' ? "the cutter's bed" : 'the chosen sheet'} leaves ${facts.mm('usableWidthMm')} × ${facts.mm('usableHeightMm')} after the ${facts.mm('marginMm')} margin`,
    advice: `It does not fit either way round: ${counted(facts.number('linesOutside'), 'line lies', 'lines lie')} beyond. Make the drawing smaller or split it${group.cause === 'beyond-bed' ? '' : ', or choose a larger sheet'}.`,
  }),
  'material-not-allowed': (_group, facts) => ({
    headline: 'This material may not be cut on this cutter',
    advice: facts.text('reason'),
  }),
  'too-thick': (_group, facts) => ({
    headline: `The material is ${facts.mm('thicknessMm')} thick; this cutter cuts at most ${facts.mm('limitMm')}`,
    advice: 'Choose thinner material or another cutter.',
  }),
  'text-not-outlined': (group, facts) => ({
    headline: `${dxfOrSvg(facts, counted(group.count, 'text element', 'text elements'), counted(group.count, 'text entity', 'text entities'))} not converted to ${dxfOrSvg(facts, 'paths', 'lines')}`,
    advice: dxfOrSvg(facts, 'Text is not cut. Convert the text to outlines (paths) in your drawing program.', 'Text is not cut. Explode it into lines or polylines in your CAD program (or delete it if it is a note).'),
  }),
  'raster-image': (group, facts) => ({
    headline: `${counted(group.count, 'raster image', 'raster images')} in the file`,
    advice: `A raster image is not cut or engraved. Trace it into ${dxfOrSvg(facts, 'paths', 'lines')}, or remove it if it is only a reference.`,
  }),
  'unmapped-colour': (_group, facts) => {
    const lines = facts.number('lines')
    const countedAs = `They are counted as "${facts.text('countedAs')}".`
    if (facts.text('format') === 'dxf') {
      return {
        headline: `${counted(lines, 'line', 'lines')} on layer "${facts.text('layer')}" in colour ${facts.text('colour')} ${lines === 1 ? 'is' : 'are'} in neither the workshop's layer mapping nor its colour mapping`,
        advice: `${countedAs} Use one of the workshop's layer names or colours to choose cut, score or engrave.`,
      }
    }
    const colour = facts.text('colour')
    return {
      headline: `${counted(lines, 'line', 'lines')} drawn in ${colour.startsWith('#') ? `colour ${colour}` : `"${colour}"`} ${lines === 1 ? 'is' : 'are'} not in the workshop's colour mapping`,
      advice: `${countedAs} Use one of the workshop's colours to choose cut, score or engrave.`,
    }
  },
  'dxf-units-assumed': () => ({
    headline: 'The DXF file does not say which units it is drawn in, so it is read in millimetres',
    advice: 'If it is drawn in inches, set the drawing units in your CAD program ($INSUNITS) and export again.',
  }),
  'dxf-dimension': (group) => ({
    headline: `${counted(group.count, 'dimension', 'dimensions')} not cut`,
    advice: 'Delete them, or put them on a layer that is turned off, before exporting.',
  }),
  'dxf-hatch': (group) => ({
    headline: `${counted(group.count, 'hatch fill', 'hatch fills')} not cut or engraved`,
    advice: 'Draw the outline you want cut as lines, or delete the hatch.',
  }),
  'dxf-entity-not-read': (group, facts) => {
    const redraw = 'Redraw them as lines, arcs or polylines.'
    if (group.cause === 'line-without-ends') return { headline: `${counted(group.count, 'LINE', 'LINEs')} without both ends, not cut`, advice: redraw }
    if (group.cause === '3d-mesh') return { headline: `${counted(group.count, '3D mesh', '3D meshes')} not cut`, advice: redraw }
    if (group.cause === 'bad-spline') return { headline: `${counted(group.count, 'SPLINE', 'SPLINEs')} whose numbers do not describe a curve (${facts.text('detail')}), not cut`, advice: redraw }
    return {
      headline: `${counted(group.count, `DXF ${facts.text('entityType')} entity`, `DXF ${facts.text('entityType')} entities`)} not read, so not cut`,
      advice: 'Explode them into lines, arcs or polylines in your CAD program.',
    }
  },
  'dxf-spline-fit-points': (group) => ({
    headline: `${counted(group.count, 'SPLINE is', 'SPLINEs are')} given only by fit points and measured as straight lines through them`,
    advice: 'Export splines with their control points (or as polylines) for an exact length.',
  }),
  'dxf-not-planar': (group) => ({
    headline: `${counted(group.count, 'entity is', 'entities are')} drawn outside the drawing plane (tilted in 3D) and not cut`,
    advice: 'Flatten the drawing onto the XY plane in your CAD program.',
  }),
}
