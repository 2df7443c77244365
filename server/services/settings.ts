import type { Knex } from 'knex'

export async function getSetting<T>(db: Knex, key: string, fallback: T): Promise<T> {
  const row = await db('settings').where({ key }).first()
  return row ? (JSON.parse(row.value_json) as T) : fallback
}

export function workshopDisplayName(db: Knex): Promise<string> {
  return getSetting(db, 'workshopName', 'Kerfbook workshop')
}
