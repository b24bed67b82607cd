import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { closeSync, openSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { waitFor } from '../../../scripts/lib/proc'
import type { Stack } from './stack'
import { freePort } from './stack'

/** A child process of the test: the API or the workers, run as they run in production. */
export interface Child {
  name: string
  process: ChildProcess
  logFile: string
  /** Set when it exited, by itself or killed: a process that should have lived did not. */
  exit: { code: number | null; signal: NodeJS.Signals | null } | null
}

function launch(stack: Stack, name: string, script: string, env: NodeJS.ProcessEnv): Child {
  const logFile = join(stack.config.dataDir, `${name}.log`)
  const fd = openSync(logFile, 'a')
  // `node --import tsx` keeps it one process, so a signal reaches the server itself.
  const proc = spawn(process.execPath, ['--import', 'tsx', script], {
    cwd: stack.config.repoRoot,
    env: { ...stack.env, ...env },
    stdio: ['ignore', fd, fd],
  })
  closeSync(fd)
  const child: Child = { name, process: proc, logFile, exit: null }
  proc.on('exit', (code, signal) => {
    child.exit = { code, signal }
  })
  return child
}

/** The last lines of a child's log, for a failure message. */
export function tail(child: Child, lines = 30): string {
  try {
    return readFileSync(child.logFile, 'utf8').trim().split('\n').slice(-lines).join('\n')
  } catch {
    return '(no log)'
  }
}

export interface App extends Child {
  baseUrl: string
}

/**
 * Starts server/main/index.ts (workers off unless `env` says otherwise) and waits until it answers
 * /api/health, whatever the health says.
 */
export async function startApp(
  stack: Stack,
  env: NodeJS.ProcessEnv = {},
  /** The port of an API this one replaces, so that its clients carry on; else a free one. */
  port?: number,
): Promise<App> {
  port ??= await freePort()
  const child = launch(stack, `api-${port}`, 'server/main/index.ts', {
    PORT: String(port),
    WAYMARK_WORKERS: 'off',
    ...env,
  })
  const app: App = { ...child, baseUrl: `http://127.0.0.1:${port}` }
  // The exit is recorded on the child object; keep the app's view of it current.
  child.process.on('exit', (code, signal) => {
    app.exit = { code, signal }
  })
  const isUp = await waitFor(async () => {
    if (app.exit) return true
    try {
      await fetch(`${app.baseUrl}/api/health`, { signal: AbortSignal.timeout(3000) })
      return true
    } catch {
      return false
    }
  }, 60_000)
  if (!isUp || app.exit) {
    await stopChild(app)
    throw new Error(`the API did not start:\n${tail(app)}`)
  }
  return app
}

/** Starts server/workers/index.ts, the job runners, as a process of their own. */
export async function startWorkers(stack: Stack, env: NodeJS.ProcessEnv = {}): Promise<Child> {
  const child = launch(stack, `workers-${Date.now()}`, 'server/workers/index.ts', env)
  const isUp = await waitFor(
    () => child.exit !== null || /workers started/.test(tail(child, 200)),
    60_000,
  )
  if (!isUp || child.exit) {
    await stopChild(child)
    throw new Error(`the workers did not start:\n${tail(child)}`)
  }
  return child
}

/** Kills the process with `signal` and waits for it to be gone. */
export async function killChild(child: Child, signal: NodeJS.Signals): Promise<void> {
  if (child.exit) return
  child.process.kill(signal)
  await waitFor(() => child.exit !== null, 15_000)
}

/** SIGTERM (a clean shutdown), then SIGKILL if it is still there after a few seconds. */
export async function stopChild(child: Child): Promise<void> {
  if (child.exit) return
  child.process.kill('SIGTERM')
  if (!(await waitFor(() => child.exit !== null, 8000))) await killChild(child, 'SIGKILL')
}
