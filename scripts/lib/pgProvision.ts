import { join } from 'node:path'
import type { ServiceConfig } from './serviceConfig'
import type { DbSecrets } from './secrets'
import { asSuper, pgBin } from './postgres'
import { mustRun } from './proc'

type Log = (line: string) => void

// Role and database names are fixed identifiers and passwords are base64url (checked when
// db.json is read), so interpolating them into SQL text needs no further quoting.

/** Runs SQL as the superuser over the unix socket, fed on stdin so passwords stay out of `ps`. */
export function adminSql(
  config: ServiceConfig,
  sql: string,
  database = 'postgres',
): Promise<string> {
  const bin = join(pgBin(config), 'psql')
  const args = ['-X', '-q', '-h', config.pgSockDir, '-p', String(config.pgPort)]
  args.push('-U', config.pgSuperuser, '-d', database, '-v', 'ON_ERROR_STOP=1', '-f', '-')
  return mustRun(bin, args, { ...asSuper(config), input: sql })
}

const roleSql = (name: string, password: string) => `
DO $$ BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '${name}') THEN CREATE ROLE ${name}; END IF;
END $$;
ALTER ROLE ${name} WITH LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS PASSWORD '${password}';
`

const databaseSql = (db: string) => `
SELECT 'CREATE DATABASE ${db} OWNER waymark_owner ENCODING ''UTF8'' TEMPLATE template0'
  WHERE NOT EXISTS (SELECT 1 FROM pg_database WHERE datname = '${db}') \\gexec
ALTER DATABASE ${db} OWNER TO waymark_owner;
REVOKE ALL ON DATABASE ${db} FROM PUBLIC;
GRANT CONNECT ON DATABASE ${db} TO waymark_app;
`

/** Creates or updates the two roles (passwords from db.json) and the databases. */
export async function provisionPostgres(
  config: ServiceConfig,
  secrets: DbSecrets,
  log: Log,
): Promise<void> {
  const sql = [
    roleSql('waymark_owner', secrets.owner.password),
    roleSql('waymark_app', secrets.app.password),
  ]
  for (const db of config.databases) sql.push(databaseSql(db))
  await adminSql(config, sql.join('\n'))
  for (const db of config.databases)
    await adminSql(config, 'ALTER SCHEMA public OWNER TO waymark_owner;', db)
  log(`postgres: roles waymark_owner, waymark_app; databases ${config.databases.join(', ')}`)
}
