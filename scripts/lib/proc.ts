import { spawn } from 'node:child_process'
import { accessSync, constants, existsSync, readFileSync } from 'node:fs'
import { createConnection } from 'node:net'
import { delimiter, join } from 'node:path'

/** A failure the CLI reports as one clear line (no stack trace), exiting 1. */
export class ServiceError extends Error {}

export interface RunOptions {
  cwd?: string
  env?: NodeJS.ProcessEnv
  /** Written to the child's stdin (keeps passwords out of the process list). */
  input?: string
  /** Run through `runuser -u <user> --` when we are root. */
  asUser?: string
}

export interface RunResult {
  code: number
  stdout: string
  stderr: string
}

function wrapUser(cmd: string, args: string[], asUser?: string): [string, string[]] {
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  return asUser && isRoot ? ['runuser', ['-u', asUser, '--', cmd, ...args]] : [cmd, args]
}

/** Runs a command to completion and captures its output. Never throws on a non-zero exit. */
export function capture(cmd: string, args: string[], opts: RunOptions = {}): Promise<RunResult> {
  const [file, argv] = wrapUser(cmd, args, opts.asUser)
  return new Promise((resolvePromise, reject) => {
    const stdin = opts.input === undefined ? 'ignore' : 'pipe'
    const child = spawn(file, argv, {
      cwd: opts.cwd,
      env: opts.env ?? process.env,
      stdio: [stdin, 'pipe', 'pipe'],
    })
    let stdout = ''
    let stderr = ''
    child.stdout?.on('data', (d: Buffer) => (stdout += d.toString()))
    child.stderr?.on('data', (d: Buffer) => (stderr += d.toString()))
    child.on('error', reject)
    child.on('close', (code, signal) =>
      resolvePromise({ code: code ?? (signal ? 128 : 1), stdout, stderr }),
    )
    if (child.stdin) {
      // A child that exits without reading its input must not crash us with EPIPE.
      child.stdin.on('error', () => {})
      child.stdin.end(opts.input)
    }
  })
}

/** Like `capture`, but throws a ServiceError carrying the command's output when it fails. */
export async function mustRun(cmd: string, args: string[], opts: RunOptions = {}): Promise<string> {
  const result = await capture(cmd, args, opts)
  if (result.code !== 0) {
    const out = `${result.stdout}\n${result.stderr}`.trim().split('\n').slice(-15).join('\n')
    throw new ServiceError(`${cmd} ${args[0] ?? ''} failed (exit ${result.code}):\n${out}`)
  }
  return result.stdout
}

/** Runs a command with the terminal attached and resolves with its exit code. */
export function runInherit(
  cmd: string,
  args: string[],
  env?: NodeJS.ProcessEnv,
  cwd?: string,
): Promise<number> {
  return new Promise((resolvePromise) => {
    const child = spawn(cmd, args, { stdio: 'inherit', env: env ?? process.env, cwd })
    child.on('error', (err) => {
      console.error(`${cmd}: ${err.message}`)
      resolvePromise(127)
    })
    child.on('close', (code, signal) => resolvePromise(code ?? (signal ? 128 : 1)))
  })
}

/** Finds an executable on PATH (plus the sbin folders, which a plain user's PATH may lack). */
export function which(name: string): string | null {
  const dirs = [
    ...(process.env.PATH ?? '').split(delimiter),
    '/usr/sbin',
    '/usr/bin',
    '/sbin',
    '/bin',
  ]
  for (const dir of dirs) {
    if (!dir) continue
    const file = join(dir, name)
    try {
      accessSync(file, constants.X_OK)
      return file
    } catch {
      // not here; keep looking
    }
  }
  return null
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function isPortOpen(port: number, host = '127.0.0.1', timeoutMs = 500): Promise<boolean> {
  return new Promise((resolvePromise) => {
    const socket = createConnection({ port, host })
    const done = (open: boolean) => {
      socket.destroy()
      resolvePromise(open)
    }
    socket.setTimeout(timeoutMs, () => done(false))
    socket.once('connect', () => done(true))
    socket.once('error', () => done(false))
  })
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

/** Polls `check` until it returns true or `timeoutMs` passes. */
export async function waitFor(
  check: () => Promise<boolean> | boolean,
  timeoutMs: number,
): Promise<boolean> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (await check()) return true
    await sleep(150)
  }
  return check()
}

/** True when `pid` is a live process (signal 0 only probes; a zombie counts as gone). */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0)
  } catch (err) {
    // EPERM: it exists but belongs to another user.
    if ((err as NodeJS.ErrnoException).code !== 'EPERM') return false
  }
  try {
    return !/^\d+ \(.*\) Z/.test(readFileSync(`/proc/${pid}/stat`, 'utf8'))
  } catch {
    return true // no /proc: trust the probe
  }
}

/**
 * Reads the pid in a pid file and returns it when that process is alive and its command
 * line mentions `expect` (a recycled pid then does not count as "our server").
 */
export function livePid(pidFile: string, expect: string): number | null {
  if (!existsSync(pidFile)) return null
  const pid = Number(readFileSync(pidFile, 'utf8').split('\n')[0].trim())
  if (!Number.isInteger(pid) || pid <= 0 || !isAlive(pid)) return null
  try {
    const cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8').replace(/\0/g, ' ')
    return cmdline.includes(expect) ? pid : null
  } catch {
    return pid // no /proc: trust the liveness probe
  }
}
