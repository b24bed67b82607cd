// A stack of our own for tests that stop and kill services: PostgreSQL, Redis, the S3 fake and the
// SMTP fake on free ports with their own data folder, never the shared ones on the default ports.
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { join } from 'node:path'
import pg from 'pg'
import { startFake, stopFake } from '../../../scripts/lib/fakeProcess'
import type { FakeSpec } from '../../../scripts/lib/fakeProcess'
import { adminSql, provisionPostgres } from '../../../scripts/lib/pgProvision'
import { startPostgres, stopPostgres } from '../../../scripts/lib/postgres'
import { capture, isAlive, waitFor } from '../../../scripts/lib/proc'
import { startRedis, stopRedis } from '../../../scripts/lib/redis'
import { startS3, stopS3 } from '../../../scripts/lib/s3'
import { ensureDbSecrets, ensureSessionSecret } from '../../../scripts/lib/secrets'
import type { DbSecrets } from '../../../scripts/lib/secrets'
import { serviceConfig, serviceEnv } from '../../../scripts/lib/serviceConfig'
import type { ServiceConfig } from '../../../scripts/lib/serviceConfig'
import { bin } from '../../../scripts/lib/steps'

const DATA_ROOT = '/var/tmp'
const DIR_PREFIX = 'waymark-faults-'
const DB = 'waymark_faults_test'
const BUCKET = 'waymark-faults'

export interface Stack {
  name: string
  config: ServiceConfig
  secrets: DbSecrets
  db: string
  bucket: string
  smtpPort: number
  /** The environment for the app, the workers and the migration: all pointed at this stack. */
  env: NodeJS.ProcessEnv
  log: string[]
}

/** A TCP port nobody listens on now (the kernel's pick). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer()
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => {
      const address = server.address()
      const port = typeof address === 'object' && address ? address.port : 0
      server.close(() => resolve(port))
    })
  })
}

/** ServiceConfig reads process.env: give it ours for the call, and put the caller's back. */
function configFor(dataDir: string, ports: Record<string, number>): ServiceConfig {
  const names = [
    'WAYMARK_DATA_DIR',
    'WAYMARK_PG_PORT',
    'WAYMARK_REDIS_PORT',
    'WAYMARK_S3_PORT',
    'WAYMARK_SMTP_PORT',
    'WAYMARK_TEST_LANE',
    'S3_ENDPOINT',
    'SMTP_URL',
  ]
  const saved = Object.fromEntries(names.map((n) => [n, process.env[n]]))
  for (const n of names) delete process.env[n]
  Object.assign(process.env, {
    WAYMARK_DATA_DIR: dataDir,
    WAYMARK_PG_PORT: String(ports.pg),
    WAYMARK_REDIS_PORT: String(ports.redis),
    WAYMARK_S3_PORT: String(ports.s3),
    WAYMARK_SMTP_PORT: String(ports.smtp),
  })
  try {
    return { ...serviceConfig(), databases: [DB], buckets: [BUCKET] }
  } finally {
    for (const n of names) {
      if (saved[n] === undefined) delete process.env[n]
      else process.env[n] = saved[n]
    }
  }
}

function smtpSpec(stack: Stack): FakeSpec {
  const { config } = stack
  return {
    name: 'smtp',
    script: 'scripts/smtpFake.ts',
    repoRoot: config.repoRoot,
    dir: config.smtpDir,
    pidFile: config.smtpPidFile,
    logFile: config.smtpLogFile,
    host: config.host,
    port: stack.smtpPort,
    portVariable: 'WAYMARK_SMTP_PORT',
    env: { ...stack.env, WAYMARK_SMTP_PORT: String(stack.smtpPort) },
  }
}

/** The pid a pid file names, when that process is alive. */
function livePidIn(file: string): number | null {
  if (!existsSync(file)) return null
  const pid = Number(readFileSync(file, 'utf8').split('\n')[0])
  return Number.isInteger(pid) && pid > 0 && isAlive(pid) ? pid : null
}

/**
 * Stops what an earlier run left behind when it was killed before its teardown (its vitest
 * process is gone), and removes its folder: its services would otherwise hold their ports and
 * memory until the machine restarts.
 */
async function sweepOrphans(): Promise<void> {
  for (const entry of readdirSync(DATA_ROOT)) {
    const match = new RegExp(`^${DIR_PREFIX}(\\d+)-`).exec(entry)
    if (!match || isAlive(Number(match[1]))) continue
    const dir = join(DATA_ROOT, entry)
    const postmaster = livePidIn(join(dir, 'pg', 'data', 'postmaster.pid'))
    if (postmaster) process.kill(postmaster, 'SIGQUIT') // immediate shutdown: the data is thrown away
    for (const file of ['redis/redis.pid', 's3/s3rver.pid', 'smtp/smtp-fake.pid']) {
      const pid = livePidIn(join(dir, file))
      if (pid) process.kill(pid, 'SIGKILL')
    }
    if (postmaster) await waitFor(() => !isAlive(postmaster), 10_000)
    rmSync(dir, { recursive: true, force: true })
  }
}

async function runOrThrow(stack: Stack, label: string, args: string[]): Promise<void> {
  const result = await capture(bin(stack.config, 'tsx'), args, {
    cwd: stack.config.repoRoot,
    env: stack.env,
  })
  if (result.code !== 0)
    throw new Error(`${label} failed (exit ${result.code}):\n${result.stdout}\n${result.stderr}`)
}

/**
 * Starts PostgreSQL, Redis, the S3 fake and the SMTP fake of our own, provisions roles, database
 * and bucket, migrates and loads the demo people and stations. `name` tells test files apart in
 * the folder name. On failure it tears down whatever it had started before throwing.
 */
export async function startStack(name: string): Promise<Stack> {
  await sweepOrphans()
  const dataDir = join(DATA_ROOT, `${DIR_PREFIX}${process.pid}-${name}`)
  rmSync(dataDir, { recursive: true, force: true })
  mkdirSync(dataDir, { recursive: true })
  const ports = { pg: 0, redis: 0, s3: 0, smtp: 0 }
  for (const key of Object.keys(ports) as (keyof typeof ports)[]) ports[key] = await freePort()
  const config = configFor(dataDir, ports)
  const log: string[] = []
  const say = (line: string) => log.push(line)
  const secrets = ensureDbSecrets(config)
  ensureSessionSecret(config)
  const stack: Stack = {
    name,
    config,
    secrets,
    db: DB,
    bucket: BUCKET,
    smtpPort: ports.smtp,
    log,
    env: childEnv(config, ports.smtp),
  }
  let mark = Date.now()
  const timed = async (label: string, work: () => Promise<unknown>) => {
    await work()
    say(`${label} ${((Date.now() - mark) / 1000).toFixed(1)} s`)
    mark = Date.now()
  }
  try {
    await timed('postgres', async () => {
      await startPostgres(config, say)
      await provisionPostgres(config, secrets, say)
    })
    await timed('redis+s3', async () => {
      await startRedis(config, say)
      await startS3(config, say)
    })
    await timed('migrate', () => runOrThrow(stack, 'migrate', ['scripts/migrate.ts']))
    await timed('seed', () => runOrThrow(stack, 'seed', ['scripts/seed.ts', '--minimal']))
    await timed('smtp', () => startFake(smtpSpec(stack), say))
  } catch (err) {
    await stopStack(stack)
    throw err
  }
  return stack
}

function childEnv(config: ServiceConfig, smtpPort: number): NodeJS.ProcessEnv {
  const inherited = { ...process.env }
  // Settings that would point a child at other services than ours.
  for (const n of ['DATABASE_URL', 'DATABASE_OWNER_URL', 'REDIS_URL', 'S3_ENDPOINT', 'SMTP_URL'])
    delete inherited[n]
  for (const n of ['S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY', 'SESSION_SECRET', 'PORT'])
    delete inherited[n]
  return {
    ...inherited,
    ...serviceEnv(config),
    WAYMARK_DB: DB,
    WAYMARK_REDIS_PREFIX: 'waymark-faults',
    S3_BUCKET: BUCKET,
    WAYMARK_SMTP_PORT: String(smtpPort),
    NODE_ENV: 'test',
    HOST: '127.0.0.1',
    LOG_LEVEL: process.env.WAYMARK_FAULTS_LOG_LEVEL ?? 'warn',
  }
}

/** Stops every service of the stack (each one even when another fails) and removes its folder. */
export async function stopStack(stack: Stack): Promise<void> {
  const quiet = () => undefined
  const { config } = stack
  const results = await Promise.allSettled([
    stopFake(smtpSpec(stack), quiet),
    stopS3(config, quiet),
    stopRedis(config, quiet),
  ])
  results.push(...(await Promise.allSettled([stopPostgres(config, quiet)])))
  const failed = results.filter((r) => r.status === 'rejected')
  if (failed.length === 0) rmSync(config.dataDir, { recursive: true, force: true })
  else throw (failed[0] as PromiseRejectedResult).reason
}

/** Stops PostgreSQL the way an operator restarting it would (fast: open transactions roll back). */
export async function stopDatabase(stack: Stack): Promise<void> {
  await stopPostgres(stack.config, () => undefined)
}

/** Starts PostgreSQL again on the same folder and port. */
export async function startDatabase(stack: Stack): Promise<void> {
  await startPostgres(stack.config, () => undefined)
}

export async function stopRedisOf(stack: Stack): Promise<void> {
  await stopRedis(stack.config, () => undefined)
}

export async function startRedisOf(stack: Stack): Promise<void> {
  await startRedis(stack.config, () => undefined)
}

/** Runs SQL as the superuser (over the socket, as the cluster's OS user); returns psql's output. */
export function superSql(stack: Stack, sql: string): Promise<string> {
  return adminSql(stack.config, sql, stack.db)
}

/** A connection as the database owner, for the tests' own reads of what was stored. */
export async function ownerClient(stack: Stack): Promise<pg.Client> {
  const client = new pg.Client({
    host: '127.0.0.1',
    port: stack.config.pgPort,
    database: stack.db,
    user: stack.secrets.owner.user,
    password: stack.secrets.owner.password,
  })
  // The server may go away under it (a restart in the test); queries then fail, no crash.
  client.on('error', () => undefined)
  await client.connect()
  return client
}
