import {
  chmodSync,
  existsSync,
  mkdirSync,
  readdirSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from 'node:fs'
import { join } from 'node:path'
import type { ServiceConfig } from './serviceConfig'
import { findPgBin } from './serviceConfig'
import { ensureDataDir } from './secrets'
import { capture, isAlive, isPortOpen, mustRun, ServiceError } from './proc'

export interface ServiceState {
  name: string
  isRunning: boolean
  port: number
  pid: number | null
  note?: string
}

type Log = (line: string) => void

// Rewritten on every start so a hand edit cannot leave a `trust` line behind: the socket
// admits only the superuser (peer: the OS user must match), TCP needs a SCRAM password.
function hbaText(config: ServiceConfig): string {
  return [
    '# Written by scripts/services.ts on every start; edits here are overwritten.',
    '# TYPE  DATABASE  USER  ADDRESS  METHOD',
    `local   all   ${config.pgSuperuser}   peer`,
    'host    all   all   127.0.0.1/32   scram-sha-256',
    '',
  ].join('\n')
}

/** The bin folder matching the cluster's major version, or the newest one for a new cluster. */
export function pgBin(config: ServiceConfig): string {
  const versionFile = join(config.pgDataDir, 'PG_VERSION')
  const version = existsSync(versionFile) ? readFileSync(versionFile, 'utf8').trim() : undefined
  const bin = findPgBin(version)
  if (!bin) throw new ServiceError('PostgreSQL server binaries not found under /usr/lib/postgresql')
  if (version && !bin.includes(`/${version}/`)) {
    throw new ServiceError(
      `the cluster in ${config.pgDataDir} is PostgreSQL ${version}, but only ${bin} is installed`,
    )
  }
  return bin
}

/** Run options for commands that must run as the cluster's OS user. */
export const asSuper = (config: ServiceConfig) => ({
  asUser: config.pgSuperuser,
  cwd: config.pgDir,
})

async function preparePgDirs(config: ServiceConfig): Promise<void> {
  ensureDataDir(config)
  mkdirSync(config.pgSockDir, { recursive: true })
  mkdirSync(config.pgDataDir, { recursive: true, mode: 0o700 })
  if (config.isRoot) {
    await mustRun('chown', ['-R', 'postgres:postgres', config.pgDir])
    const probe = await capture('test', ['-w', config.pgDir], { asUser: 'postgres', cwd: '/' })
    if (probe.code !== 0) {
      throw new ServiceError(
        `the postgres user cannot reach ${config.pgDir}; set WAYMARK_DATA_DIR to a folder outside /root`,
      )
    }
  }
  chmodSync(config.pgDataDir, 0o700)
  chmodSync(config.pgSockDir, 0o700)
}

async function initCluster(config: ServiceConfig, log: Log): Promise<void> {
  if (existsSync(join(config.pgDataDir, 'PG_VERSION'))) return
  // A data folder without PG_VERSION is a half-finished initdb: start it over.
  for (const entry of readdirSync(config.pgDataDir))
    rmSync(join(config.pgDataDir, entry), { recursive: true })
  const args = ['-D', config.pgDataDir, '-U', config.pgSuperuser, '--auth-local=peer']
  args.push('--auth-host=scram-sha-256', '-E', 'UTF8', '--locale=C.UTF-8')
  await mustRun(join(pgBin(config), 'initdb'), args, asSuper(config))
  log(`postgres: initialised cluster in ${config.pgDataDir}`)
}

function writeHba(config: ServiceConfig): boolean {
  const file = join(config.pgDataDir, 'pg_hba.conf')
  const text = hbaText(config)
  if (existsSync(file) && readFileSync(file, 'utf8') === text) return false
  writeFileSync(file, text, { mode: 0o600 })
  return true
}

/** Pid and port from postmaster.pid when that postmaster is alive. */
function postmaster(config: ServiceConfig): { pid: number; port: number } | null {
  const file = join(config.pgDataDir, 'postmaster.pid')
  if (!existsSync(file)) return null
  const lines = readFileSync(file, 'utf8').split('\n')
  const pid = Number(lines[0])
  return Number.isInteger(pid) && pid > 0 && isAlive(pid) ? { pid, port: Number(lines[3]) } : null
}

/** Creates (if needed) and starts the cluster; safe to call when it already runs. */
export async function startPostgres(config: ServiceConfig, log: Log): Promise<void> {
  await preparePgDirs(config)
  await initCluster(config, log)
  const isHbaChanged = writeHba(config)
  if (config.isRoot)
    await mustRun('chown', ['postgres:postgres', join(config.pgDataDir, 'pg_hba.conf')])
  const running = postmaster(config)
  const ctl = join(pgBin(config), 'pg_ctl')
  if (running) {
    if (running.port !== config.pgPort) {
      throw new ServiceError(
        `postgres: already running on port ${running.port}, not ${config.pgPort}; stop it first`,
      )
    }
    if (isHbaChanged) await mustRun(ctl, ['-D', config.pgDataDir, 'reload'], asSuper(config))
    log(`postgres: already running on ${config.host}:${config.pgPort} (pid ${running.pid})`)
    return
  }
  if (await isPortOpen(config.pgPort)) {
    throw new ServiceError(
      `postgres: port ${config.pgPort} is taken by another program; set WAYMARK_PG_PORT`,
    )
  }
  const options = [
    `-c listen_addresses=${config.host}`,
    `-p ${config.pgPort}`,
    `-k '${config.pgSockDir}'`,
    '-c password_encryption=scram-sha-256',
  ].join(' ')
  const args = ['-D', config.pgDataDir, '-l', config.pgLogFile, '-w', '-t', '60']
  args.push('-o', options, 'start')
  const result = await capture(ctl, args, asSuper(config))
  if (result.code !== 0) {
    const tail = existsSync(config.pgLogFile)
      ? readFileSync(config.pgLogFile, 'utf8').trim().split('\n').slice(-8)
      : []
    throw new ServiceError(
      `postgres: failed to start:\n${result.stderr.trim()}\n${tail.join('\n')}`,
    )
  }
  log(
    `postgres: started on ${config.host}:${config.pgPort} (pid ${postmaster(config)?.pid ?? '?'})`,
  )
}

/** Stops the cluster this project started (fast mode: rolls back open transactions). */
export async function stopPostgres(config: ServiceConfig, log: Log): Promise<void> {
  const running = postmaster(config)
  if (!running) {
    log('postgres: not running')
    return
  }
  await mustRun(
    join(pgBin(config), 'pg_ctl'),
    ['-D', config.pgDataDir, '-m', 'fast', '-w', 'stop'],
    asSuper(config),
  )
  log(`postgres: stopped (pid ${running.pid})`)
}

export function postgresState(config: ServiceConfig): ServiceState {
  const running = postmaster(config)
  return {
    name: 'postgres',
    isRunning: !!running,
    port: running?.port ?? config.pgPort,
    pid: running?.pid ?? null,
  }
}
