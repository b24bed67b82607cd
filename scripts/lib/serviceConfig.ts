import { existsSync, readdirSync } from 'node:fs'
import { userInfo } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'

/** Where the local services live and how to reach them. Everything derives from env + defaults. */
export interface ServiceConfig {
  repoRoot: string
  isRoot: boolean
  /** The OS user that runs PostgreSQL and is its superuser over the socket (peer auth). */
  pgSuperuser: string
  dataDir: string
  host: '127.0.0.1'
  pgPort: number
  redisPort: number
  s3Port: number
  /** Newest (or the cluster's own) PostgreSQL server bin folder; null when not installed. */
  pgBin: string | null
  pgDir: string
  pgDataDir: string
  pgSockDir: string
  pgLogFile: string
  redisDir: string
  redisPidFile: string
  redisLogFile: string
  s3Dir: string
  s3PidFile: string
  s3LogFile: string
  smtpPort: number
  smtpDir: string
  smtpPidFile: string
  smtpLogFile: string
  /** SMTP_URL is set: mail goes to that server and no local fake is run. */
  isSmtpExternal: boolean
  /** S3_ENDPOINT when set (then no local fake is run), else the local fake's URL. */
  s3Endpoint: string
  isS3External: boolean
  secretsDir: string
  dbSecretsFile: string
  sessionSecretFile: string
  databases: readonly string[]
  buckets: readonly string[]
}

export const DATABASES = ['waymark', 'waymark_test', 'waymark_bench_test'] as const
export const BUCKETS = ['waymark', 'waymark-test'] as const

/**
 * WAYMARK_TEST_LANE=1…9 gives `npm test` its own database, Redis prefix and bucket
 * (waymark_lane1_test, waymark-lane1-test), so two checkouts on one machine can test at once.
 */
export function testLane(): string | null {
  const raw = process.env.WAYMARK_TEST_LANE
  if (raw === undefined || raw === '') return null
  if (!/^[1-9]$/.test(raw)) throw new Error(`WAYMARK_TEST_LANE must be 1-9, got "${raw}"`)
  return raw
}

/** Database, Redis prefix and bucket names of the test run (lane-suffixed when set). */
export function testNames(): { db: string; redisPrefix: string; bucket: string } {
  const lane = testLane()
  return lane
    ? {
        db: `waymark_lane${lane}_test`,
        redisPrefix: `waymark-lane${lane}-test`,
        bucket: `waymark-lane${lane}-test`,
      }
    : { db: 'waymark_test', redisPrefix: 'waymark-test', bucket: 'waymark-test' }
}

/** A TCP port from the environment; 0 ("any free port") only where `isAnyAllowed`. */
function portFromEnv(name: string, fallback: number, isAnyAllowed = false): number {
  const raw = process.env[name]
  if (raw === undefined || raw === '') return fallback
  const port = Number(raw)
  if (!Number.isInteger(port) || port < (isAnyAllowed ? 0 : 1) || port > 65535) {
    throw new Error(`${name} must be a TCP port number, got "${raw}"`)
  }
  return port
}

/**
 * Finds a PostgreSQL server bin folder under /usr/lib/postgresql. Prefers `version` (the
 * major version a cluster was made with) and otherwise takes the newest one installed.
 */
export function findPgBin(version?: string): string | null {
  const root = '/usr/lib/postgresql'
  if (!existsSync(root)) return null
  const versions = readdirSync(root)
    .filter(
      (v) =>
        existsSync(join(root, v, 'bin', 'postgres')) && existsSync(join(root, v, 'bin', 'initdb')),
    )
    .sort((a, b) => Number(b) - Number(a))
  if (version && versions.includes(version)) return join(root, version, 'bin')
  return versions.length > 0 ? join(root, versions[0], 'bin') : null
}

/** Reads the service configuration from the environment (see the defaults below). */
export function serviceConfig(): ServiceConfig {
  const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..')
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  const user = userInfo().username
  // /var/tmp, not the repo: the postgres user cannot enter /root, and /tmp may be wiped on boot.
  const dataDir = resolve(
    process.env.WAYMARK_DATA_DIR || (isRoot ? '/var/tmp/waymark' : `/var/tmp/waymark-${user}`),
  )
  const s3Port = portFromEnv('WAYMARK_S3_PORT', 56569)
  const pgDir = join(dataDir, 'pg')
  const secretsDir = join(dataDir, 'secrets')
  const externalS3 = process.env.S3_ENDPOINT
  return {
    repoRoot,
    isRoot,
    pgSuperuser: isRoot ? 'postgres' : user,
    dataDir,
    host: '127.0.0.1',
    pgPort: portFromEnv('WAYMARK_PG_PORT', 55432),
    redisPort: portFromEnv('WAYMARK_REDIS_PORT', 56379),
    s3Port,
    pgBin: findPgBin(),
    pgDir,
    pgDataDir: join(pgDir, 'data'),
    pgSockDir: join(pgDir, 'sock'),
    pgLogFile: join(pgDir, 'log'),
    redisDir: join(dataDir, 'redis'),
    redisPidFile: join(dataDir, 'redis', 'redis.pid'),
    redisLogFile: join(dataDir, 'redis', 'redis.log'),
    s3Dir: join(dataDir, 's3'),
    s3PidFile: join(dataDir, 's3', 's3rver.pid'),
    s3LogFile: join(dataDir, 's3', 's3rver.log'),
    // `npm test` sets 0: the app's in-process mail fake takes any free port, and scripts the tests
    // run (backup, restore) must still read the rest of the configuration.
    smtpPort: portFromEnv('WAYMARK_SMTP_PORT', 2526, true),
    smtpDir: join(dataDir, 'smtp'),
    smtpPidFile: join(dataDir, 'smtp', 'smtp-fake.pid'),
    smtpLogFile: join(dataDir, 'smtp', 'smtp-fake.log'),
    isSmtpExternal: Boolean(process.env.SMTP_URL),
    s3Endpoint: externalS3 || `http://127.0.0.1:${s3Port}`,
    isS3External: Boolean(externalS3),
    secretsDir,
    dbSecretsFile: join(secretsDir, 'db.json'),
    sessionSecretFile: join(secretsDir, 'session-secret'),
    databases: testLane() ? [...DATABASES, testNames().db] : DATABASES,
    buckets: testLane() ? [...BUCKETS, testNames().bucket] : BUCKETS,
  }
}

/**
 * Environment for child processes (migrate, seed, server, tests) so they find the same
 * services; server/env.ts reads these names. Credentials are not in here: the app reads
 * them from `$WAYMARK_DATA_DIR/secrets/`. S3_ENDPOINT is passed on only when the caller set
 * it: unset is what tells the app to use the local fake and its fixed credentials.
 */
export function serviceEnv(config: ServiceConfig): Record<string, string> {
  return {
    WAYMARK_DATA_DIR: config.dataDir,
    WAYMARK_PG_PORT: String(config.pgPort),
    WAYMARK_REDIS_PORT: String(config.redisPort),
    WAYMARK_S3_PORT: String(config.s3Port),
    WAYMARK_SMTP_PORT: String(config.smtpPort),
    S3_BUCKET: process.env.S3_BUCKET || 'waymark',
    // The pinned AWS SDK works on Node 20; its notice about later releases is noise here.
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED:
      process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED || 'true',
  }
}

/**
 * The environment of a test run's child processes: the services, the lane's database, Redis
 * prefix and bucket (testNames), and port 0 for anything that listens, so that it never takes the
 * 4870 of a running `npm start` (the mail fake's port too).
 */
export function testRunEnv(config: ServiceConfig): NodeJS.ProcessEnv {
  const names = testNames()
  return {
    ...process.env,
    ...serviceEnv(config),
    WAYMARK_DB: names.db,
    WAYMARK_REDIS_PREFIX: names.redisPrefix,
    S3_BUCKET: names.bucket,
    NODE_ENV: 'test',
    WAYMARK_SMTP_PORT: '0',
    PORT: '0',
  }
}
