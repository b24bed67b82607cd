import { join } from 'node:path'
import pg from 'pg'
import { env } from '../../server/env'
import { adminSql } from './pgProvision'
import { mustRun, ServiceError } from './proc'
import { findPgBin, serviceConfig } from './serviceConfig'

// The database half of a backup: Debian's pg_dump (custom format) and pg_restore, connected as
// the owner role the migrations use, with the password in the environment rather than in `ps`.

const DB_NAME = /^[a-z_][a-z0-9_]*$/

/** The owner role's URL for database `name` (the app's database when `name` is unset). */
export function ownerUrlFor(name?: string): string {
  const base = env.ownerDatabaseUrl
  if (!base) throw new ServiceError('no database URL: start the services or set DATABASE_URL')
  const url = new URL(base)
  if (name) {
    if (!DB_NAME.test(name)) throw new ServiceError(`--db: "${name}" is not a database name`)
    url.pathname = `/${name}`
  }
  return url.toString()
}

/** The database a URL names. */
export const databaseOf = (url: string) => decodeURIComponent(new URL(url).pathname.slice(1))

function pgTool(name: 'pg_dump' | 'pg_restore'): string {
  const bin = findPgBin()
  if (!bin) throw new ServiceError('PostgreSQL client tools not found under /usr/lib/postgresql')
  return join(bin, name)
}

/** libpq's connection arguments and environment for a URL. */
function connection(url: string): { args: string[]; env: NodeJS.ProcessEnv } {
  const u = new URL(url)
  return {
    args: ['-h', u.hostname, '-p', u.port || '5432', '-U', decodeURIComponent(u.username)],
    env: { ...process.env, PGPASSWORD: decodeURIComponent(u.password) },
  }
}

/** Dumps the database at `url` into `file` (custom format, compressed). */
export async function dumpDatabase(url: string, file: string): Promise<void> {
  const c = connection(url)
  await mustRun(pgTool('pg_dump'), [...c.args, '-d', databaseOf(url), '-Fc', '-f', file], {
    env: c.env,
  })
}

/**
 * How many tables the database at `url` has in its public schema; null when it does not exist.
 */
export async function tableCount(url: string): Promise<number | null> {
  const client = new pg.Client({ connectionString: url })
  try {
    await client.connect()
  } catch (err) {
    if ((err as { code?: string }).code === '3D000') return null
    throw err
  }
  try {
    const { rows } = await client.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM pg_tables WHERE schemaname = 'public'`,
    )
    return rows[0]!.n
  } finally {
    await client.end()
  }
}

/**
 * Creates database `name` as provisioning does (owned by the owner role, the app role may
 * connect). Only on the local services: elsewhere a database is made by whoever runs the server.
 */
export async function createDatabase(name: string): Promise<void> {
  if (process.env.DATABASE_URL || process.env.DATABASE_OWNER_URL)
    throw new ServiceError(`database ${name} does not exist: create it first, then restore`)
  if (!DB_NAME.test(name)) throw new ServiceError(`--db: "${name}" is not a database name`)
  const config = serviceConfig()
  const owner = decodeURIComponent(new URL(ownerUrlFor()).username)
  await adminSql(
    config,
    `CREATE DATABASE ${name} OWNER ${owner} ENCODING 'UTF8' TEMPLATE template0;
     REVOKE ALL ON DATABASE ${name} FROM PUBLIC;
     GRANT CONNECT ON DATABASE ${name} TO ${env.appDbRole};`,
  )
  await adminSql(config, `ALTER SCHEMA public OWNER TO ${owner};`, name)
}

/** Drops database `name` on the local services (the backup test cleans up with it). */
export async function dropDatabase(name: string): Promise<void> {
  if (!DB_NAME.test(name)) throw new ServiceError(`"${name}" is not a database name`)
  await adminSql(serviceConfig(), `DROP DATABASE IF EXISTS ${name} WITH (FORCE);`)
}

/**
 * Restores a custom-format dump into the database at `url`, all or nothing. With `clean`, what
 * the dump holds is dropped first (restore --force into a database that has data).
 */
export async function restoreDatabase(url: string, file: string, clean: boolean): Promise<void> {
  const c = connection(url)
  const args = [...c.args, '-d', databaseOf(url), '--no-owner', '--exit-on-error']
  args.push('--single-transaction', ...(clean ? ['--clean', '--if-exists'] : []), file)
  await mustRun(pgTool('pg_restore'), args, { env: c.env })
}
