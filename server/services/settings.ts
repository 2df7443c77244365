import type { Knex } from 'knex'
import { DEFAULT_WORKSHOP_SETTINGS, type WorkshopSettings } from '#shared/schemas/settings'
import { nowIso } from '../utils/rows'

export async function getSetting<T>(db: Knex, key: string, fallback: T): Promise<T> {
  const row = await db('settings').where({ key }).first()
  return row ? (JSON.parse(row.value_json) as T) : fallback
}

export function workshopDisplayName(db: Knex): Promise<string> {
  return getSetting(db, 'workshopName', DEFAULT_WORKSHOP_SETTINGS.workshopName)
}

export async function workshopSettings(db: Knex): Promise<WorkshopSettings> {
  const rows = await db('settings').whereIn('key', Object.keys(DEFAULT_WORKSHOP_SETTINGS))
  const stored = Object.fromEntries(rows.map((r) => [r.key, JSON.parse(r.value_json)]))
  return { ...DEFAULT_WORKSHOP_SETTINGS, ...stored }
}

export async function updateWorkshopSettings(db: Knex, change: Partial<WorkshopSettings>): Promise<WorkshopSettings> {
  await db.transaction(async (trx) => {
    for (const [key, value] of Object.entries(change)) {
      if (value === undefined) continue
      await trx('settings')
        .insert({ key, value_json: JSON.stringify(value) })
        .onConflict('key')
        .merge({ value_json: JSON.stringify(value), updated_at: nowIso() })
    }
  })
  return workshopSettings(db)
}
