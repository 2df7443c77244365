// Migration 0010 turns revisions stored with one finding object per site and JSON polylines into summary
// columns, finding groups and packed geometry; these rows are written as the earlier code wrote them.
import { gunzipSync } from 'node:zlib'
import knex, { type Knex } from 'knex'
import { afterEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { decodeGeometry, decodeSites } from '../../shared/packed-analysis'

const BEFORE = '0009_dxf_layers'

function memoryDb(): Knex {
  return knex({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true, pool: { min: 1, max: 1 }, migrations: { migrationSource } })
}

/** The migrations up to and including `last`, then the rest, as an upgrade of an existing database runs them. */
async function migrateUpTo(db: Knex, last: string): Promise<void> {
  const names = await migrationSource.getMigrations([])
  for (const name of names) {
    await db.migrate.up({ name })
    if (name === last) return
  }
}

function legacyAnalysis(findings: object[], contours?: object[]) {
  return {
    bbox: { x: 0, y: 0, width: 90, height: 60 },
    cut: { lengthMm: 310.27, pierces: 2, closedContours: 2, openContours: 0 },
    score: { lengthMm: 12 },
    engrave: { areaMm2: 0 },
    travelMm: 40,
    time: { cutS: 18.6, scoreS: 0.5, engraveS: 0, pierceS: 1, travelS: 0.4, setupS: 0, totalS: 20.5 },
    billableMinutes: 1,
    price: { amount: 150, currency: 'EUR' },
    sheet: { fits: true, rotated: false, copies: 12, fitsBed: true },
    findings,
    ...(contours ? { contours } : {}),
  }
}

const bridge = (x: number, valueMm: number) => ({ code: 'narrow-bridge', severity: 'warning', message: 'A long sentence about a bridge.', x, y: 5, valueMm, limitMm: 3, contours: [0, 1] })
const slit = (x: number) => ({ code: 'open-contour', severity: 'info', message: 'An open cut (a slit).', x, y: 9, contours: [1] })
const square = { operation: 'cut', closed: true, points: [0, 0, 10, 0, 10, 10, 0, 10, 0, 0] }
const line = { operation: 'score', closed: false, points: [2, 2, 8, 8] }

let db: Knex | undefined
afterEach(async () => {
  await db?.destroy()
  db = undefined
})

describe('migration 0010: summaries written once', () => {
  it('fills the summary columns, groups the stored findings and packs the preview of existing revisions', async () => {
    db = memoryDb()
    await migrateUpTo(db, BEFORE)
    await db.raw('PRAGMA foreign_keys = OFF')
    const findings = [bridge(10, 1.5), bridge(20, 1.2), bridge(30, 1.8), slit(40), slit(50)]
    await db('file_revisions').insert([
      { id: 1, job_file_id: 1, revision: 1, sha256: 'a'.repeat(64), original_name: 'a.svg', size_bytes: 10, content_type: 'image/svg+xml', uploaded_by: 1, analysis_json: JSON.stringify(legacyAnalysis(findings)), preview_json: JSON.stringify([square, line]) },
      // The oldest rows kept their contours inside the analysis.
      { id: 2, job_file_id: 1, revision: 2, sha256: 'b'.repeat(64), original_name: 'b.svg', size_bytes: 10, content_type: 'image/svg+xml', uploaded_by: 1, analysis_json: JSON.stringify(legacyAnalysis([], [square])), preview_json: null },
    ])
    await db.migrate.latest()

    const first = await db('file_revisions').where({ id: 1 }).first()
    expect(first).toMatchObject({
      cut_length_mm: 310.27,
      pierces: 2,
      score_length_mm: 12,
      bbox_width_mm: 90,
      bbox_height_mm: 60,
      time_total_s: 20.5,
      time_cut_s: 18.6,
    })
    expect(first).toMatchObject({ warning_count: 3, warning_groups: 1, note_count: 2, note_groups: 1, error_count: 0, error_groups: 0, preview_json: null })
    const stored = JSON.parse(first.analysis_json)
    expect(stored.findings).toBeUndefined()
    expect(stored.findingGroups.map((g: any) => [g.code, g.severity, g.count, g.firstSite])).toEqual([
      ['narrow-bridge', 'warning', 3, 0],
      ['open-contour', 'info', 2, 3],
    ])
    expect(stored.findingGroups[0].box).toEqual([10, 5, 30, 5])
    expect(stored.findingGroups[0].facts.limitMm).toBe(3)

    const payload = await db('revision_payloads').where({ file_revision_id: 1 }).first()
    const geometry = decodeGeometry(gunzipSync(payload.geometry_gz))
    expect(geometry.count).toBe(2)
    expect(Array.from(geometry.start)).toEqual([0, 5, 7])
    expect(Array.from(geometry.xy.subarray(0, 4))).toEqual([0, 0, 10, 0])
    expect(geometry.bbox).toEqual([0, 0, 10, 10])
    const sites = decodeSites(gunzipSync(payload.sites_gz))
    expect(sites.count).toBe(5)
    expect(Array.from(sites.value.subarray(0, 3))).toEqual([Math.fround(1.5), Math.fround(1.2), Math.fround(1.8)])
    expect(Number.isNaN(sites.value[3])).toBe(true)
    expect(Array.from(sites.contourA)).toEqual([0, 0, 0, 1, 1])
    expect(Array.from(sites.contourB)).toEqual([1, 1, 1, -1, -1])

    const second = await db('revision_payloads').where({ file_revision_id: 2 }).first()
    expect(decodeGeometry(gunzipSync(second.geometry_gz)).count).toBe(1)
    expect(decodeSites(gunzipSync(second.sites_gz)).count).toBe(0)
  })

  it("keeps a damaged revision as empty figures, and turns a job's note on its warnings into a reason per warning group", async () => {
    db = memoryDb()
    await migrateUpTo(db, BEFORE)
    await db.raw('PRAGMA foreign_keys = OFF')
    await db('jobs').insert({ id: 7, member_id: 3, title: 'Lamp', cutter_id: 1, material_id: 1, sheet_id: 1, state: 'submitted', warnings_acknowledgement: 'The hinges fold by design.' })
    await db('job_files').insert({ id: 1, job_id: 7, name: 'panel' })
    const row = (id: number, revision: number, analysis: string) => ({ id, job_file_id: 1, revision, sha256: String(id).repeat(64).slice(0, 64), original_name: 'p.svg', size_bytes: 1, content_type: 'image/svg+xml', uploaded_by: 3, analysis_json: analysis, preview_json: null })
    await db('file_revisions').insert([
      row(1, 1, '{"findings": 12, "bbox": null'),
      row(2, 2, JSON.stringify(legacyAnalysis([bridge(10, 1.5), bridge(20, 1.2), slit(30)]))),
    ])
    await db.migrate.latest()

    const damaged = await db('file_revisions').where({ id: 1 }).first()
    expect(damaged).toMatchObject({ cut_length_mm: 0, pierces: 0, warning_count: 0 })
    expect(JSON.parse(damaged.analysis_json).findingGroups).toEqual([])
    expect(decodeGeometry(gunzipSync((await db('revision_payloads').where({ file_revision_id: 1 }).first()).geometry_gz)).count).toBe(0)

    const reasons = await db('finding_acknowledgements').select('file_revision_id', 'group_key', 'reason', 'acknowledged_by')
    const warningKey = JSON.parse((await db('file_revisions').where({ id: 2 }).first()).analysis_json).findingGroups.find((g: any) => g.severity === 'warning').key
    // Only the current revision's warning group (not the note, not the older revision).
    expect(reasons).toEqual([{ file_revision_id: 2, group_key: warningKey, reason: 'The hinges fold by design.', acknowledged_by: 3 }])
  })
})
