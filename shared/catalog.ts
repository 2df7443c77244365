// Stable codes of the catalog; the UI shows the labels.
export const CUTTER_KINDS = ['co2-laser', 'fiber-laser', 'plasma', 'other'] as const
export type CutterKind = (typeof CUTTER_KINDS)[number]
export const CUTTER_KIND_LABELS: Record<CutterKind, string> = {
  'co2-laser': 'CO₂ laser',
  'fiber-laser': 'Fibre laser',
  plasma: 'Plasma table',
  other: 'Other cutter',
}

export const CUTTER_STATUSES = ['active', 'maintenance', 'retired'] as const
export type CutterStatus = (typeof CUTTER_STATUSES)[number]
export const CUTTER_STATUS_LABELS: Record<CutterStatus, string> = {
  active: 'In service',
  maintenance: 'Under maintenance',
  retired: 'Retired',
}

export const MATERIAL_FAMILIES = ['wood', 'paper-board', 'acrylic', 'mild-steel', 'stainless', 'aluminium', 'textile', 'other'] as const
export type MaterialFamily = (typeof MATERIAL_FAMILIES)[number]
export const MATERIAL_FAMILY_LABELS: Record<MaterialFamily, string> = {
  wood: 'Wood',
  'paper-board': 'Paper & board',
  acrylic: 'Acrylic',
  'mild-steel': 'Mild steel',
  stainless: 'Stainless steel',
  aluminium: 'Aluminium',
  textile: 'Textile',
  other: 'Other',
}

export const OPERATIONS = ['cut', 'score', 'engrave', 'ignore'] as const
export type Operation = (typeof OPERATIONS)[number]
export const OPERATION_LABELS: Record<Operation, string> = {
  cut: 'Cut through',
  score: 'Score (part depth)',
  engrave: 'Engrave area',
  ignore: 'Ignore (guides, notes)',
}

export const WEEKDAY_LABELS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const
