import { createHash, randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import type { Knex } from 'knex'
import { databasePath } from '../../db/knexfile'

// Uploaded files live on disk by content hash (SHA-256). A file is written before the database row
// that refers to it, through a temporary name and an atomic rename, so a crash leaves at worst a
// file nothing refers to — which sweepOrphanUploads removes — and never a row without its file.
export function uploadsDir(): string {
  return resolve(process.env.UPLOADS_PATH || join(dirname(databasePath()), 'uploads'))
}

function pathOf(sha256: string): string {
  return join(uploadsDir(), sha256.slice(0, 2), sha256)
}

export function sha256Of(bytes: Buffer | string): string {
  return createHash('sha256').update(bytes).digest('hex')
}

export function storeUpload(bytes: Buffer | string): string {
  const sha256 = sha256Of(bytes)
  const target = pathOf(sha256)
  if (!existsSync(target)) {
    mkdirSync(dirname(target), { recursive: true })
    const temporary = `${target}.${randomBytes(6).toString('hex')}.part`
    writeFileSync(temporary, bytes)
    renameSync(temporary, target)
  }
  return sha256
}

export function readUpload(sha256: string): Buffer {
  return readFileSync(pathOf(sha256))
}

/** Removes stored files no revision refers to, older than `minAgeMs` so an upload in flight is left alone. */
export async function sweepOrphanUploads(db: Knex, minAgeMs = 3600_000): Promise<number> {
  const root = uploadsDir()
  if (!existsSync(root)) return 0
  const referenced = new Set((await db('file_revisions').distinct('sha256')).map((r) => r.sha256 as string))
  let removed = 0
  for (const folder of readdirSync(root)) {
    for (const name of readdirSync(join(root, folder))) {
      const path = join(root, folder, name)
      const sha256 = name.replace(/\..*$/, '')
      if ((name.endsWith('.part') || !referenced.has(sha256)) && Date.now() - statSync(path).mtimeMs >= minAgeMs) {
        rmSync(path, { force: true })
        removed++
      }
    }
  }
  return removed
}
