import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Knex } from 'knex'
import { migrateLatest, openDatabase } from '../../../db/index'
import { seedDemo } from '../../../db/seeds/demo'

/** A fresh database file with every migration and the demo workshop (without its history unless asked). */
export async function demoDatabase(options: { history?: boolean } = {}): Promise<{ db: Knex; close: () => Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), 'kerfbook-history-test-'))
  const db = openDatabase(join(dir, 'test.sqlite'))
  await migrateLatest(db)
  // A stand-in hash: these tests never sign in.
  await seedDemo(db, async () => 'not-a-real-hash', options)
  return {
    db,
    close: async () => {
      await db.destroy()
      rmSync(dir, { recursive: true, force: true })
    },
  }
}
