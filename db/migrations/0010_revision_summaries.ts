import { gzipSync } from 'node:zlib'
import type { Knex } from 'knex'
import { encodeGeometry, encodeSites } from '../../shared/packed-analysis'
import { summaryColumns } from '../../server/services/revision-summary'
import { utcNowDefault } from '../schema-helpers'
import { contoursV1, groupFindingsV1, type ContourV1, type FindingV1 } from '../legacy/analysis-v1'

// Lists and estimates read a revision's figures and finding counts from columns written once; the
// analysis JSON keeps only the finding groups (no per-site objects), and the preview geometry and the
// site table live as packed, gzip-compressed bytes in a table of their own that only the preview reads.
// Members acknowledge warnings per finding group. Existing revisions are converted here.
// The columns as this migration adds them: a later column is a later migration, so this list never grows.
const REAL_COLUMNS = ['cut_length_mm', 'score_length_mm', 'engrave_area_mm2', 'bbox_x_mm', 'bbox_y_mm', 'bbox_width_mm', 'bbox_height_mm', 'time_cut_s', 'time_score_s', 'time_engrave_s', 'time_pierce_s', 'time_travel_s', 'time_setup_s', 'time_total_s'] as const
const INTEGER_COLUMNS = ['pierces', 'error_count', 'warning_count', 'note_count', 'error_groups', 'warning_groups', 'note_groups'] as const
const COLUMNS = [...REAL_COLUMNS, ...INTEGER_COLUMNS]

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('file_revisions', (t) => {
    for (const name of REAL_COLUMNS) t.double(name).notNullable().defaultTo(0)
    for (const name of INTEGER_COLUMNS) t.integer(name).notNullable().defaultTo(0)
  })
  await knex.schema.createTable('revision_payloads', (t) => {
    t.integer('file_revision_id').primary().references('file_revisions.id').onDelete('CASCADE')
    t.binary('geometry_gz').notNullable()
    t.binary('sites_gz').notNullable()
  })
  await knex.schema.createTable('finding_acknowledgements', (t) => {
    t.increments('id')
    t.integer('file_revision_id').notNullable().references('file_revisions.id').onDelete('CASCADE')
    t.string('group_key').notNullable()
    t.text('reason').notNullable()
    t.integer('acknowledged_by').notNullable().references('users.id')
    t.string('created_at').notNullable().defaultTo(utcNowDefault(knex))
    t.unique(['file_revision_id', 'group_key'])
  })
  await convertStoredRevisions(knex)
}

async function convertStoredRevisions(knex: Knex): Promise<void> {
  const ids: number[] = (await knex('file_revisions').orderBy('id').select('id')).map((row) => row.id)
  for (const id of ids) {
    const row = await knex('file_revisions').where({ id }).first('analysis_json', 'preview_json')
    const { analysis, contours, findings } = readV1(id, row)
    const { groups, sites } = groupFindingsV1(findings)
    const converted = { ...analysis, findingGroups: groups }
    const columns = summaryColumns(converted as Parameters<typeof summaryColumns>[0])
    await knex('file_revisions')
      .where({ id })
      .update({
        ...Object.fromEntries(COLUMNS.map((name) => [name, Number(columns[name]) || 0])),
        analysis_json: JSON.stringify(converted),
        preview_json: null,
      })
    await knex('revision_payloads').insert({ file_revision_id: id, geometry_gz: gzipSync(encodeGeometry(contoursV1(contours))), sites_gz: gzipSync(encodeSites(sites)) })
  }
  await carryOverAcknowledgements(knex)
}

/** A stored revision as the earlier code wrote it; a damaged one reads as empty (logged) rather than stopping the start. */
function readV1(id: number, row: { analysis_json: string; preview_json: string | null }) {
  try {
    const { findings, contours: inline, ...analysis } = JSON.parse(row.analysis_json) as Record<string, unknown>
    const preview = row.preview_json ? JSON.parse(row.preview_json) : inline
    const zero = { x: 0, y: 0, width: 0, height: 0, lengthMm: 0, pierces: 0, areaMm2: 0 }
    return {
      analysis: { bbox: zero, cut: zero, score: zero, engrave: zero, time: {}, ...analysis },
      findings: (Array.isArray(findings) ? findings : []) as FindingV1[],
      contours: (Array.isArray(preview) ? preview.filter((c) => Array.isArray(c?.points)) : []) as ContourV1[],
    }
  } catch (error) {
    console.warn(`[migration 0010] revision ${id}: stored analysis unreadable (${(error as Error).message}); kept with empty figures`)
    const empty = { bbox: { x: 0, y: 0, width: 0, height: 0 }, cut: { lengthMm: 0, pierces: 0 }, score: { lengthMm: 0 }, engrave: { areaMm2: 0 }, time: {} }
    return { analysis: empty, findings: [], contours: [] }
  }
}

/** A job's one note on its warnings becomes the reason for every warning group of its current revisions. */
async function carryOverAcknowledgements(knex: Knex): Promise<void> {
  const jobs = await knex('jobs').whereNotNull('warnings_acknowledgement').select('id', 'member_id', 'warnings_acknowledgement')
  for (const job of jobs) {
    const revisions = await knex('file_revisions as r')
      .join('job_files as f', 'f.id', 'r.job_file_id')
      .where('f.job_id', job.id)
      .whereNull('f.removed_at')
      .whereRaw('r.revision = (select max(revision) from file_revisions where job_file_id = f.id)')
      .select('r.id', 'r.analysis_json')
    for (const revision of revisions) {
      const groups = (JSON.parse(revision.analysis_json).findingGroups ?? []) as { key: string; severity: string }[]
      const rows = groups.filter((g) => g.severity === 'warning').map((g) => ({ file_revision_id: revision.id, group_key: g.key, reason: job.warnings_acknowledgement, acknowledged_by: job.member_id }))
      if (rows.length > 0) await knex('finding_acknowledgements').insert(rows).onConflict(['file_revision_id', 'group_key']).ignore()
    }
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('finding_acknowledgements')
  await knex.schema.dropTable('revision_payloads')
  await knex.schema.alterTable('file_revisions', (t) => {
    for (const name of COLUMNS) t.dropColumn(name)
  })
}
