import type { Knex } from 'knex'
import { insertedId } from '../dialect'

// Demo catalog of the invented Wrenfield Sheetworks. The machine and process values are in the
// range the trade uses, written from memory as demo data: they are not machine-maker figures.
// Minimum bridge ≈ one thickness on a laser and 1.5–2 thicknesses on plasma, minimum plasma hole
// ≈ one thickness: common practice, no source.

const NOT_ON_LASER_METAL = 'The CO₂ laser here does not cut metal (reflective, no assist gas for it).'
const PLASMA_METAL_ONLY = 'Plasma cuts only electrically conductive metal.'
const CHLORINE = 'Contains chlorine: lasering it releases corrosive, toxic gas. Never in a laser.'

export const demoCutters = [
  {
    name: 'Heron — CO₂ laser',
    kind: 'co2-laser',
    bed_width_mm: 1300,
    bed_height_mm: 900,
    max_thickness_mm: 10,
    price_per_minute_minor: 85,
    currency: 'EUR',
    setup_minutes: 5,
    billing_increment_minutes: 1,
    booking_granularity_minutes: 15,
    max_speed_mm_per_min: 30000,
    accel_mm_per_s2: 3000,
    rapid_mm_per_min: 36000,
    junction_deviation_mm: 0.05,
    pierce_overhead_s: 0.2,
    notes: '80 W tube, honeycomb bed. Lid closed and someone watching for the whole cut.',
  },
  {
    name: 'Anvil — plasma table',
    kind: 'plasma',
    bed_width_mm: 1500,
    bed_height_mm: 3000,
    max_thickness_mm: 12,
    price_per_minute_minor: 150,
    currency: 'EUR',
    setup_minutes: 10,
    billing_increment_minutes: 5,
    booking_granularity_minutes: 30,
    max_speed_mm_per_min: 8000,
    accel_mm_per_s2: 1000,
    rapid_mm_per_min: 20000,
    junction_deviation_mm: 0.1,
    pierce_overhead_s: 1.0,
    notes: 'Water table. Shaded eye protection; keep the table clear and dry around the cut.',
  },
] as const

type Rule = [kind: string, reason: string]
interface DemoMaterial {
  name: string
  family: string
  thickness_mm: number
  hazard_note: string
  sheets: [widthMm: number, heightMm: number, priceMinor: number][]
  disallowed: Rule[]
}

const lasersOnly: Rule[] = [['plasma', PLASMA_METAL_ONLY]]
const plasmaOnly: Rule[] = [['co2-laser', NOT_ON_LASER_METAL]]

export const demoMaterials: DemoMaterial[] = [
  { name: 'Birch plywood', family: 'wood', thickness_mm: 3, hazard_note: 'Glue lines can flare: watch the cut.', sheets: [[600, 400, 450], [1220, 610, 980]], disallowed: lasersOnly },
  { name: 'Grey board', family: 'paper-board', thickness_mm: 2, hazard_note: 'Paper dust and embers: clear the bed after each job.', sheets: [[700, 1000, 220]], disallowed: lasersOnly },
  { name: 'Cast acrylic', family: 'acrylic', thickness_mm: 3, hazard_note: 'Burns readily once lit; never leave it cutting alone.', sheets: [[600, 400, 790]], disallowed: lasersOnly },
  { name: 'Mild steel', family: 'mild-steel', thickness_mm: 1.5, hazard_note: 'Sharp edges and hot dross: gloves when unloading.', sheets: [[1250, 2500, 5800]], disallowed: plasmaOnly },
  { name: 'Mild steel', family: 'mild-steel', thickness_mm: 3, hazard_note: 'Heavy sheet: two people to load.', sheets: [[1250, 2500, 10500]], disallowed: plasmaOnly },
  { name: 'Aluminium', family: 'aluminium', thickness_mm: 1, hazard_note: 'Fine dust is flammable: keep the table clean.', sheets: [[1000, 2000, 4400]], disallowed: plasmaOnly },
  { name: 'Galvanised steel', family: 'mild-steel', thickness_mm: 1.5, hazard_note: 'Zinc fumes: extraction on and a respirator.', sheets: [[1250, 2500, 7200]], disallowed: plasmaOnly },
  {
    name: 'PVC foam board',
    family: 'other',
    thickness_mm: 3,
    hazard_note: 'Chlorine-bearing plastic.',
    sheets: [[500, 1000, 600]],
    disallowed: [['co2-laser', CHLORINE], ['fiber-laser', CHLORINE], ['plasma', PLASMA_METAL_ONLY]],
  },
  {
    name: 'Polycarbonate',
    family: 'other',
    thickness_mm: 2,
    hazard_note: 'Cuts badly and gives off harmful fumes on a CO₂ laser.',
    sheets: [[500, 1000, 900]],
    disallowed: [['co2-laser', 'Melts, discolours and gives off harmful fumes on a CO₂ laser.'], ['plasma', PLASMA_METAL_ONLY]],
  },
]

// [cutter index, material name, thickness, cut mm/min, kerf, pierce s, min bridge, min hole, score, engrave, line interval]
type SettingRow = [number, string, number, number, number, number, number, number, number, number, number]
const demoSettings: SettingRow[] = [
  [0, 'Birch plywood', 3, 1200, 0.2, 0.1, 3, 1, 6000, 18000, 0.1],
  [0, 'Grey board', 2, 1800, 0.15, 0.05, 2, 0.8, 9000, 24000, 0.1],
  [0, 'Cast acrylic', 3, 600, 0.15, 0.2, 3, 1.5, 4000, 15000, 0.08],
  [1, 'Mild steel', 1.5, 3800, 1.3, 0.3, 2.5, 1.5, 8000, 8000, 1],
  [1, 'Mild steel', 3, 2800, 1.5, 0.5, 5, 3, 8000, 8000, 1],
  [1, 'Aluminium', 1, 4500, 1.2, 0.2, 2, 1, 9000, 9000, 1],
  [1, 'Galvanised steel', 1.5, 3800, 1.3, 0.3, 2.5, 1.5, 8000, 8000, 1],
]

// The workshop's own stroke-colour mapping (tolerance: Euclidean distance in 8-bit RGB).
export const demoColours = [
  { label: 'Cut through', hex: '#ff6a00', tolerance: 24, operation: 'cut' },
  { label: 'Score line', hex: '#7a3cff', tolerance: 24, operation: 'score' },
  { label: 'Engrave', hex: '#0a7d38', tolerance: 24, operation: 'engrave' },
  { label: 'Guide (not cut)', hex: '#a0a0a0', tolerance: 16, operation: 'ignore' },
]

// The workshop's DXF layer names, checked before colours.
export const demoDxfLayers = [
  { layer: 'CUT', operation: 'cut' },
  { layer: 'SCORE', operation: 'score' },
  { layer: 'ENGRAVE', operation: 'engrave' },
  { layer: 'GUIDES', operation: 'ignore' },
]

// [cutter index, ISO weekday, opens, closes] in workshop time.
const demoHours: [number, number, string, string][] = [
  [0, 2, '10:00', '20:00'],
  [0, 3, '10:00', '20:00'],
  [0, 4, '10:00', '20:00'],
  [0, 5, '10:00', '18:00'],
  [0, 6, '10:00', '16:00'],
  [1, 3, '09:00', '17:00'],
  [1, 4, '09:00', '17:00'],
  [1, 6, '09:00', '13:00'],
]

const daysFromNow = (now: Date, days: number, hourUtc: number) => {
  const d = new Date(now)
  d.setUTCDate(d.getUTCDate() + days)
  d.setUTCHours(hourUtc, 0, 0, 0)
  return d.toISOString()
}

/** The catalog of the demo workshop; its closures lie ahead of `now` and its sign-offs date from that day. */
export async function seedDemoCatalog(trx: Knex, now = new Date()): Promise<void> {
  const cutterIds: number[] = []
  for (const cutter of demoCutters) cutterIds.push(await insertedId(trx('cutters').insert(cutter)))

  const materialIds = new Map<string, number>()
  for (const m of demoMaterials) {
    const id = await insertedId(trx('materials').insert({ name: m.name, family: m.family, thickness_mm: m.thickness_mm, hazard_note: m.hazard_note }))
    materialIds.set(`${m.name}@${m.thickness_mm}`, id)
    await trx('material_sheets').insert(m.sheets.map(([w, h, price]) => ({ material_id: id, width_mm: w, height_mm: h, price_minor: price, currency: 'EUR' })))
    await trx('material_cutter_rules').insert(m.disallowed.map(([kind, reason]) => ({ material_id: id, cutter_kind: kind, allowed: false, reason })))
  }

  await trx('process_settings').insert(
    demoSettings.map(([cutter, name, thickness, speed, kerf, pierce, bridge, hole, score, engrave, interval]) => ({
      cutter_id: cutterIds[cutter],
      material_id: materialIds.get(`${name}@${thickness}`),
      cut_speed_mm_per_min: speed,
      kerf_mm: kerf,
      pierce_s: pierce,
      min_bridge_mm: bridge,
      min_hole_mm: hole,
      score_speed_mm_per_min: score,
      engrave_speed_mm_per_min: engrave,
      engrave_line_interval_mm: interval,
    })),
  )
  await trx('operation_colours').insert(demoColours)
  await trx('dxf_layer_operations').insert(demoDxfLayers)
  await trx('opening_hours').insert(demoHours.map(([cutter, weekday, opens, closes]) => ({ cutter_id: cutterIds[cutter], weekday, opens_at: opens, closes_at: closes })))
  await trx('closures').insert([
    { cutter_id: cutterIds[1], starts_at: daysFromNow(now, 16, 8), ends_at: daysFromNow(now, 16, 17), reason: 'Torch service and new consumables' },
    { cutter_id: null, starts_at: daysFromNow(now, 30, 0), ends_at: daysFromNow(now, 32, 0), reason: 'Workshop closed for the river festival' },
  ])

  const users = new Map((await trx('users').select('id', 'email')).map((u) => [u.email as string, u.id as number]))
  const staffId = users.get('staff@example.test')!
  const today = now.toISOString().slice(0, 10)
  await trx('sign_offs').insert([
    { user_id: users.get('member@example.test'), cutter_id: cutterIds[0], signed_off_on: today, signed_off_by: staffId, note: 'Laser induction, evening group' },
    { user_id: users.get('ines@example.test'), cutter_id: cutterIds[0], signed_off_on: today, signed_off_by: staffId, note: '' },
    { user_id: users.get('ines@example.test'), cutter_id: cutterIds[1], signed_off_on: today, signed_off_by: staffId, note: 'Plasma induction incl. dross handling' },
    { user_id: users.get('reuben@example.test'), cutter_id: cutterIds[1], signed_off_on: '2025-03-01', expires_on: '2026-03-01', signed_off_by: staffId, note: 'Lapsed: needs a refresher' },
  ])
}
