import type { Knex } from 'knex'
import * as accounts from './0001_accounts'
import * as catalog from './0002_catalog'
import * as jobs from './0003_jobs'
import * as bookings from './0004_bookings'
import * as payments from './0005_payments'
import * as operations from './0006_operations'
import * as cuttingDay from './0007_cutting_day'
import * as revisionPreview from './0008_revision_preview'
import * as dxfLayers from './0009_dxf_layers'
import * as revisionSummaries from './0010_revision_summaries'
import * as moneyMail from './0011_money_mail'
import * as userSessions from './0012_user_sessions'
import * as historyIndexes from './0013_history_indexes'
import * as cutterOutages from './0014_cutter_outages'
import * as analysisTasks from './0015_analysis_tasks'

// Append-only: a schema change is a new file added at the end of this list, never an edit of a landed one. The one
// exception: a PostgreSQL branch may be added to a landed migration (a PostgreSQL database always starts empty, so it
// runs every migration as it is now), while the SQLite branch stays exactly as it ran.
// Migrations are imported statically so the bundled server and the CLI run the same list.
const migrations: Record<string, Knex.Migration> = {
  '0001_accounts': accounts,
  '0002_catalog': catalog,
  '0003_jobs': jobs,
  '0004_bookings': bookings,
  '0005_payments': payments,
  '0006_operations': operations,
  '0007_cutting_day': cuttingDay,
  '0008_revision_preview': revisionPreview,
  '0009_dxf_layers': dxfLayers,
  '0010_revision_summaries': revisionSummaries,
  '0011_money_mail': moneyMail,
  '0012_user_sessions': userSessions,
  '0013_history_indexes': historyIndexes,
  '0014_cutter_outages': cutterOutages,
  '0015_analysis_tasks': analysisTasks,
}

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(migrations),
  getMigrationName: (name) => name,
  getMigration: async (name) => migrations[name]!,
}
