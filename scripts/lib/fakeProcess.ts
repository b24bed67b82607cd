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
import type { ServiceState } from './postgres'
import type { ServiceConfig } from './serviceConfig'
import { isAlive, isPortOpen, livePid, ServiceError, waitFor } from './proc'

type Log = (line: string) => void

/** A local stand-in for a hosted service (object store, mail relay) run from a script of ours. */
export interface FakeSpec {
  /** Short name for log lines: `s3`, `smtp`. */
  name: string
  /** The script, relative to the repository, e.g. `scripts/s3Fake.ts`; also checked in the pid's command line. */
  script: string
  repoRoot: string
  dir: string
  pidFile: string
  logFile: string
  host: string
  port: number
  /** The variable that moves the port, named in the "port taken" message. */
  portVariable: string
  env: NodeJS.ProcessEnv
  /** Node flags the fake needs, before the script. */
  nodeFlags?: readonly string[]
}

/**
 * The spec of one of our fakes (`s3`, `smtp`): its folder, pid file, log file and port are the
 * config's fields named after it; the script is `scripts/<name>Fake.ts`.
 */
export function fakeSpec(
  config: ServiceConfig,
  name: 's3' | 'smtp',
  more: Pick<FakeSpec, 'portVariable' | 'env' | 'nodeFlags'>,
): FakeSpec {
  return {
    name,
    script: `scripts/${name}Fake.ts`,
    repoRoot: config.repoRoot,
    dir: config[`${name}Dir`],
    pidFile: config[`${name}PidFile`],
    logFile: config[`${name}LogFile`],
    host: config.host,
    port: config[`${name}Port`],
    ...more,
  }
}

const markOf = (spec: FakeSpec) => spec.script.replace(/^.*\//, '').replace(/\.ts$/, '')

/**
 * Starts the fake in the background (own process group, so Ctrl-C elsewhere spares it) unless
 * the one named in our pid file already answers. Returns false when it was already running.
 */
export async function startFake(spec: FakeSpec, log: Log): Promise<boolean> {
  mkdirSync(spec.dir, { recursive: true, mode: 0o700 })
  const running = livePid(spec.pidFile, markOf(spec))
  if (running && (await isPortOpen(spec.port))) {
    log(`${spec.name}: already running on ${spec.host}:${spec.port} (pid ${running})`)
    return false
  }
  if (running)
    throw new ServiceError(
      `${spec.name}: pid ${running} is alive but port ${spec.port} does not answer`,
    )
  rmSync(spec.pidFile, { force: true })
  if (await isPortOpen(spec.port))
    throw new ServiceError(
      `${spec.name}: port ${spec.port} is taken by another program; set ${spec.portVariable}`,
    )
  const logFd = openSync(spec.logFile, 'a')
  // `node --import tsx` keeps it one process, so the pid we record is the server itself.
  const child = spawn(
    process.execPath,
    [...(spec.nodeFlags ?? []), '--import', 'tsx', spec.script],
    {
      cwd: spec.repoRoot,
      detached: true,
      stdio: ['ignore', logFd, logFd],
      env: spec.env,
    },
  )
  closeSync(logFd)
  const pid = child.pid
  if (!pid) throw new ServiceError(`${spec.name}: could not spawn the fake`)
  child.unref()
  writeFileSync(spec.pidFile, `${pid}\n`)
  const isUp = await waitFor(async () => !isAlive(pid) || (await isPortOpen(spec.port)), 20000)
  if (!isUp || !isAlive(pid)) {
    const tail = existsSync(spec.logFile)
      ? readFileSync(spec.logFile, 'utf8').split('\n').slice(-8)
      : []
    rmSync(spec.pidFile, { force: true })
    throw new ServiceError(`${spec.name}: the fake did not start:\n${tail.join('\n')}`)
  }
  return true
}

/** Stops the fake named in our pid file, and only that one. */
export async function stopFake(spec: FakeSpec, log: Log): Promise<void> {
  const pid = livePid(spec.pidFile, markOf(spec))
  if (!pid) {
    rmSync(spec.pidFile, { force: true })
    log(`${spec.name}: not running`)
    return
  }
  process.kill(pid, 'SIGTERM')
  if (!(await waitFor(() => !isAlive(pid), 5000))) process.kill(pid, 'SIGKILL')
  await waitFor(() => !isAlive(pid), 2000)
  rmSync(spec.pidFile, { force: true })
  log(`${spec.name}: stopped (pid ${pid})`)
}

/** Whether the fake named in our pid file is alive. */
export function fakeState(spec: FakeSpec): ServiceState {
  const pid = livePid(spec.pidFile, markOf(spec))
  return { name: spec.name, isRunning: !!pid, port: spec.port, pid }
}
