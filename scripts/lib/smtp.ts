import { spawn } from 'node:child_process'
import {
  closeSync,
  existsSync,
  mkdirSync,
  openSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from 'node:fs'
import type { ServiceConfig } from './serviceConfig'
import { serviceEnv } from './serviceConfig'
import type { ServiceState } from './postgres'
import { isAlive, isPortOpen, livePid, ServiceError, waitFor } from './proc'

type Log = (line: string) => void

const MARK = 'smtpFake'

/**
 * Runs the SMTP fake in the background (own process group, so Ctrl-C elsewhere spares it).
 * It files mail in the database named by WAYMARK_DB of the caller (waymark by default).
 */
export async function startSmtp(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isSmtpExternal) {
    log('smtp: using SMTP_URL (no local fake)')
    return
  }
  mkdirSync(config.smtpDir, { recursive: true, mode: 0o700 })
  const running = livePid(config.smtpPidFile, MARK)
  if (running && (await isPortOpen(config.smtpPort))) {
    log(`smtp: already running on ${config.host}:${config.smtpPort} (pid ${running})`)
    return
  }
  if (running)
    throw new ServiceError(
      `smtp: pid ${running} is alive but port ${config.smtpPort} does not answer`,
    )
  rmSync(config.smtpPidFile, { force: true })
  if (await isPortOpen(config.smtpPort)) {
    throw new ServiceError(
      `smtp: port ${config.smtpPort} is taken by another program; set WAYMARK_SMTP_PORT`,
    )
  }
  const database = process.env.WAYMARK_DB || 'waymark'
  const logFd = openSync(config.smtpLogFile, 'a')
  // `node --import tsx` keeps it one process, so the pid we record is the server itself.
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/smtpFake.ts'], {
    cwd: config.repoRoot,
    detached: true,
    stdio: ['ignore', logFd, logFd],
    env: { ...process.env, ...serviceEnv(config), WAYMARK_DB: database },
  })
  closeSync(logFd)
  const pid = child.pid
  if (!pid) throw new ServiceError('smtp: could not spawn the fake')
  child.unref()
  writeFileSync(config.smtpPidFile, `${pid}\n`)
  if (
    !(await waitFor(async () => !isAlive(pid) || (await isPortOpen(config.smtpPort)), 20000)) ||
    !isAlive(pid)
  ) {
    const tail = existsSync(config.smtpLogFile)
      ? readFileSync(config.smtpLogFile, 'utf8').split('\n').slice(-8)
      : []
    rmSync(config.smtpPidFile, { force: true })
    throw new ServiceError(`smtp: the fake did not start:\n${tail.join('\n')}`)
  }
  log(
    `smtp: started on ${config.host}:${config.smtpPort} (pid ${pid}); files mail into ${database}`,
  )
}

/** Stops the fake named in our pid file. */
export async function stopSmtp(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isSmtpExternal) return
  const pid = livePid(config.smtpPidFile, MARK)
  if (!pid) {
    rmSync(config.smtpPidFile, { force: true })
    log('smtp: not running')
    return
  }
  process.kill(pid, 'SIGTERM')
  if (!(await waitFor(() => !isAlive(pid), 5000))) process.kill(pid, 'SIGKILL')
  await waitFor(() => !isAlive(pid), 2000)
  rmSync(config.smtpPidFile, { force: true })
  log(`smtp: stopped (pid ${pid})`)
}

export function smtpState(config: ServiceConfig): ServiceState {
  if (config.isSmtpExternal)
    return { name: 'smtp', isRunning: true, port: config.smtpPort, pid: null, note: 'SMTP_URL' }
  const pid = livePid(config.smtpPidFile, MARK)
  return { name: 'smtp', isRunning: !!pid, port: config.smtpPort, pid }
}
