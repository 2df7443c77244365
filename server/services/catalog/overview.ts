import type { Knex } from 'knex'
import type { CutterKind, CutterStatus } from '#shared/catalog'
import { cautionsFor, type Caution } from '#shared/safety'
import { listCutters } from './cutters'
import { listMaterials } from './materials'
import { listProcessSettings } from './process-settings'

export interface CuttableMaterial {
  materialId: number
  name: string
  thicknessMm: number
  /** allowed: may go on this kind of cutter; cuttable: and the workshop has a process setting for it here. */
  allowed: boolean
  cuttable: boolean
  /** Thicker than the cutter takes: pages say so with the cutter's limit in the reader's unit (`reason` says it in mm). */
  tooThick: boolean
  reason: string
  kerfMm: number | null
  minBridgeMm: number | null
  hazardNote: string
  cautions: Caution[]
}

export interface CutterOverview {
  cutterId: number
  name: string
  kind: CutterKind
  status: CutterStatus
  bedWidthMm: number
  bedHeightMm: number
  maxThicknessMm: number
  pricePerMinuteMinor: number
  currency: string
  cautions: Caution[]
  materials: CuttableMaterial[]
}

/** The member's "what can I cut" view: per cutter, every material with whether and how it can be cut. */
export async function cuttingOverview(db: Knex): Promise<CutterOverview[]> {
  const [cutters, materials, settings] = await Promise.all([listCutters(db), listMaterials(db), listProcessSettings(db)])
  return cutters.map((cutter) => ({
    cutterId: cutter.id,
    name: cutter.name,
    kind: cutter.kind,
    status: cutter.status,
    bedWidthMm: cutter.bedWidthMm,
    bedHeightMm: cutter.bedHeightMm,
    maxThicknessMm: cutter.maxThicknessMm,
    pricePerMinuteMinor: cutter.pricePerMinuteMinor,
    currency: cutter.currency,
    cautions: cautionsFor(cutter.kind),
    materials: materials.map((material) => {
      const rule = material.rules.find((r) => r.cutterKind === cutter.kind)
      const setting = settings.find((s) => s.cutterId === cutter.id && s.materialId === material.id)
      const allowed = rule?.allowed ?? true
      const tooThick = material.thicknessMm > cutter.maxThicknessMm
      return {
        materialId: material.id,
        name: material.name,
        thicknessMm: material.thicknessMm,
        allowed,
        cuttable: allowed && !tooThick && !!setting,
        tooThick,
        reason: !allowed ? rule!.reason : tooThick ? `Thicker than this cutter's ${cutter.maxThicknessMm} mm limit.` : setting ? '' : 'No process setting on this cutter yet.',
        kerfMm: setting?.kerfMm ?? null,
        minBridgeMm: setting?.minBridgeMm ?? null,
        hazardNote: material.hazardNote,
        cautions: cautionsFor(cutter.kind, material).filter((c) => !cautionsFor(cutter.kind).some((k) => k.code === c.code)),
      }
    }),
  }))
}
