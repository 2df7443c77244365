import { createHash } from 'node:crypto'
import type { Knex } from 'knex'
import { isPostgres } from '../../db/dialect'

/** The first key of every duty's advisory lock; the second is the duty's name, hashed. */
const DUTY_LOCK_CLASS = 5_045_002

const keyOf = (name: string) => createHash('sha256').update(name).digest().readInt32BE(0)

/**
 * Runs a background duty unless another app server is running the same one right now; answers undefined when it
 * skipped. On PostgreSQL several app servers share the database, and a transaction-scoped advisory lock (held on
 * one pooled connection while the duty works on others) lets only one of them in at a time. A duty still claims
 * each row it acts on with a conditional update, so even runs one after another never act twice. SQLite has one
 * app server per database file: the duty just runs.
 */
export async function runAlone<T>(db: Knex, name: string, duty: () => Promise<T>): Promise<T | undefined> {
  if (!isPostgres(db)) return duty()
  return db.transaction(async (trx) => {
    const { rows } = await trx.raw<{ rows: { got: boolean }[] }>('SELECT pg_try_advisory_xact_lock(?, ?) AS got', [DUTY_LOCK_CLASS, keyOf(name)])
    return rows[0]?.got ? duty() : undefined
  })
}
