// A throwaway PostgreSQL server for tests and benchmarks: a new cluster in a temporary folder (initdb), started on
// a free port on 127.0.0.1 only, with its socket in that folder; stop() shuts it down and deletes the folder.
// Uses the server programs of Debian's `postgresql` package (POSTGRES_BINDIR overrides where they are). As root it
// runs them as the `postgres` account, since PostgreSQL refuses to run as root.
import { execFileSync, spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { chmodSync, chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir, userInfo } from 'node:os'
import { join } from 'node:path'
import pg from 'pg'
import { freePort } from './free-port'

export interface PostgresServer {
  /** postgres://…/postgres, the maintenance database; createPostgresDatabase() makes fresh ones. */
  url: string
  port: number
  stop(): void
}

/**
 * Creates an empty database named `prefix` and a random suffix on the server at `serverUrl` (its maintenance
 * database's URL); `options` are CREATE DATABASE's own (a template, a locale). Answers the new database's URL.
 */
export async function createPostgresDatabase(serverUrl: string, prefix: string, options = ''): Promise<string> {
  const database = `${prefix.replace(/[^a-z0-9]+/gi, '_').toLowerCase()}_${randomBytes(4).toString('hex')}`
  const client = new pg.Client({ connectionString: serverUrl })
  await client.connect()
  try {
    await client.query(`CREATE DATABASE ${database} ${options}`)
  } finally {
    await client.end()
  }
  const url = new URL(serverUrl)
  url.pathname = `/${database}`
  return url.toString()
}

/** The folder holding initdb, pg_ctl and postgres, or undefined when PostgreSQL's server is not installed. */
export function postgresBinDir(): string | undefined {
  if (process.env.POSTGRES_BINDIR) return process.env.POSTGRES_BINDIR
  const root = '/usr/lib/postgresql'
  if (!existsSync(root)) return undefined
  const versions = readdirSync(root)
    .filter((v) => existsSync(join(root, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a))
  return versions[0] ? join(root, versions[0], 'bin') : undefined
}

export const POSTGRES_MISSING =
  'PostgreSQL is not installed: install it with `apt-get install -y postgresql` (as root), or set POSTGRES_BINDIR to the folder holding initdb and pg_ctl.'

export async function startPostgres(name = 'kerfbook-pg'): Promise<PostgresServer> {
  const bin = postgresBinDir()
  if (!bin) throw new Error(POSTGRES_MISSING)
  const asRoot = userInfo().uid === 0
  const dir = mkdtempSync(join(tmpdir(), `${name}-`))
  const data = join(dir, 'data')
  if (asRoot) {
    const uid = Number(execFileSync('id', ['-u', 'postgres']).toString())
    const gid = Number(execFileSync('id', ['-g', 'postgres']).toString())
    chownSync(dir, uid, gid)
    chmodSync(dir, 0o700)
  }
  // A server program, as the `postgres` account when this runs as root.
  const spawnProgram = (program: string, args: string[]) =>
    asRoot
      ? spawnSync('runuser', ['-u', 'postgres', '--', join(bin, program), ...args], { encoding: 'utf8', cwd: dir })
      : spawnSync(join(bin, program), args, { encoding: 'utf8', cwd: dir })
  const run = (program: string, args: string[]) => {
    const result = spawnProgram(program, args)
    if (result.status !== 0) throw new Error(`${program} failed (${result.status}): ${result.stderr || result.stdout}`)
  }
  const port = await freePort()
  run('initdb', ['-D', data, '-U', 'kerfbook', '-A', 'trust', '-E', 'UTF8', '--locale', 'C', '--no-sync'])
  // Loopback only; fsync off: a test cluster is thrown away, so durability buys nothing and costs time.
  const options = `-c listen_addresses=127.0.0.1 -c port=${port} -c unix_socket_directories=${dir} -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200`
  run('pg_ctl', ['-D', data, '-l', join(dir, 'server.log'), '-o', options, '-w', 'start'])
  const base = `postgres://kerfbook@127.0.0.1:${port}`
  const stop = () => {
    spawnProgram('pg_ctl', ['-D', data, '-m', 'fast', '-w', 'stop'])
    rmSync(dir, { recursive: true, force: true })
  }
  return { url: `${base}/postgres`, port, stop }
}
