import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import type { ServiceConfig } from './serviceConfig'
import type { ServiceState } from './postgres'
import { capture, isAlive, isPortOpen, livePid, mustRun, ServiceError, waitFor } from './proc'

type Log = (line: string) => void

async function ping(config: ServiceConfig): Promise<boolean> {
  const result = await capture('redis-cli', [
    '-h',
    config.host,
    '-p',
    String(config.redisPort),
    'ping',
  ])
  return result.code === 0 && result.stdout.trim() === 'PONG'
}

/** Starts redis-server (daemonized, AOF on) unless our pid file names a live one. */
export async function startRedis(config: ServiceConfig, log: Log): Promise<void> {
  mkdirSync(config.redisDir, { recursive: true, mode: 0o700 })
  const pid = livePid(config.redisPidFile, 'redis-server')
  if (pid) {
    if (!(await waitFor(() => ping(config), 5000))) {
      throw new ServiceError(
        `redis: pid ${pid} is alive but does not answer on port ${config.redisPort}`,
      )
    }
    log(`redis: already running on ${config.host}:${config.redisPort} (pid ${pid})`)
    return
  }
  rmSync(config.redisPidFile, { force: true })
  if (await isPortOpen(config.redisPort)) {
    throw new ServiceError(
      `redis: port ${config.redisPort} is taken by another program; set WAYMARK_REDIS_PORT`,
    )
  }
  const args = ['--bind', config.host, '--port', String(config.redisPort), '--daemonize', 'yes']
  args.push(
    '--pidfile',
    config.redisPidFile,
    '--logfile',
    config.redisLogFile,
    '--dir',
    config.redisDir,
  )
  args.push('--appendonly', 'yes', '--save', '', '--protected-mode', 'yes')
  await mustRun('redis-server', args)
  if (!(await waitFor(() => ping(config), 10000))) {
    const tail = existsSync(config.redisLogFile)
      ? readFileSync(config.redisLogFile, 'utf8').split('\n').slice(-8)
      : []
    throw new ServiceError(`redis: did not answer on port ${config.redisPort}:\n${tail.join('\n')}`)
  }
  const started = livePid(config.redisPidFile, 'redis-server')
  log(`redis: started on ${config.host}:${config.redisPort} (pid ${started ?? '?'})`)
}

/** Stops the redis-server named in our pid file and waits for it to exit. */
export async function stopRedis(config: ServiceConfig, log: Log): Promise<void> {
  const pid = livePid(config.redisPidFile, 'redis-server')
  if (!pid) {
    rmSync(config.redisPidFile, { force: true })
    log('redis: not running')
    return
  }
  process.kill(pid, 'SIGTERM')
  if (!(await waitFor(() => !isAlive(pid), 15000)))
    throw new ServiceError(`redis: pid ${pid} did not exit`)
  rmSync(config.redisPidFile, { force: true })
  log(`redis: stopped (pid ${pid})`)
}

export function redisState(config: ServiceConfig): ServiceState {
  const pid = livePid(config.redisPidFile, 'redis-server')
  return { name: 'redis', isRunning: !!pid, port: config.redisPort, pid }
}
