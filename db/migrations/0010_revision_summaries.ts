import { gzipSync } from 'node:zlib'
import type { Knex } from 'knex'
import { encodeGeometry, encodeSites } from '../../shared/packed-analysis'
import { SUMMARY_COLUMN_NAMES, summaryColumns } from '../../server/services/revision-summary'
import { contoursV1, groupFindingsV1, type ContourV1, type FindingV1 } from '../legacy/analysis-v1'

// Lists and estimates read a revision's figures and finding counts from columns written once; the
// analysis JSON keeps only the finding groups (no per-site objects), and the preview geometry and the
// site table live as packed, gzip-compressed bytes in a table of their own that only the preview reads.
// Members acknowledge warnings per finding group. Existing revisions are converted here.
const INTEGER_COLUMNS = new Set(['pierces', 'error_count', 'warning_count', 'note_count', 'error_groups', 'warning_groups', 'note_groups'])

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('file_revisions', (t) => {
    for (const name of SUMMARY_COLUMN_NAMES) {
      if (INTEGER_COLUMNS.has(name)) t.integer(name).notNullable().defaultTo(0)
      else t.double(name).notNullable().defaultTo(0)
    }
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
    t.string('created_at').notNullable().defaultTo(knex.raw("(strftime('%Y-%m-%dT%H:%M:%fZ','now'))"))
    t.unique(['file_revision_id', 'group_key'])
  })
  await convertStoredRevisions(knex)
}

async function convertStoredRevisions(knex: Knex): Promise<void> {
  const ids: number[] = (await knex('file_revisions').orderBy('id').select('id')).map((row) => row.id)
  for (const id of ids) {
    const row = await knex('file_revisions').where({ id }).first('analysis_json', 'preview_json')
    const { findings = [], contours: inlineContours, ...rest } = JSON.parse(row.analysis_json) as Record<string, any> & { findings?: FindingV1[]; contours?: ContourV1[] }
    const contours: ContourV1[] = row.preview_json ? JSON.parse(row.preview_json) : (inlineContours ?? [])
    const { groups, sites } = groupFindingsV1(findings)
    const analysis = { ...rest, findingGroups: groups }
    await knex('file_revisions')
      .where({ id })
      .update({ ...summaryColumns(analysis as Parameters<typeof summaryColumns>[0]), analysis_json: JSON.stringify(analysis), preview_json: null })
    await knex('revision_payloads').insert({ file_revision_id: id, geometry_gz: gzipSync(encodeGeometry(contoursV1(contours))), sites_gz: gzipSync(encodeSites(sites)) })
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('finding_acknowledgements')
  await knex.schema.dropTable('revision_payloads')
  await knex.schema.alterTable('file_revisions', (t) => {
    for (const name of SUMMARY_COLUMN_NAMES) t.dropColumn(name)
  })
}
