import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { fileURLToPath } from 'node:url'

const ROOT = fileURLToPath(new URL('../..', import.meta.url))

/** A child process of the app (an API or a worker) and everything it has printed so far. */
export interface AppProcess {
  name: string
  child: ChildProcess
  output: () => string
}

/**
 * Starts `script` (relative to the repository) under tsx as a child process with this process's
 * environment plus `env`, collecting its stdout and stderr for waits and failure messages.
 */
export function startAppProcess(
  name: string,
  script: string,
  env: Record<string, string>,
): AppProcess {
  // node --import tsx: one process per child, so its pid is the one to signal.
  const child = spawn(process.execPath, ['--import', 'tsx', script], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let text = ''
  const keep = (chunk: Buffer) => {
    text += chunk.toString('utf8')
    if (text.length > 200_000) text = text.slice(-100_000)
  }
  child.stdout!.on('data', keep)
  child.stderr!.on('data', keep)
  return { name, child, output: () => text }
}

/** Waits until the process prints something matching `pattern`; fails if it exits first. */
export async function waitForOutput(
  p: AppProcess,
  pattern: RegExp,
  timeoutMs: number,
): Promise<RegExpMatchArray> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const match = p.output().match(pattern)
    if (match) return match
    if (p.child.exitCode !== null || p.child.signalCode !== null)
      throw new Error(`${p.name} exited (${p.child.exitCode}) before ready:\n${p.output()}`)
    if (Date.now() > deadline)
      throw new Error(`${p.name} not ready within ${timeoutMs} ms:\n${p.output()}`)
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** Starts an API process on a free port and returns its base URL once it listens. */
export async function startApi(
  name: string,
  env: Record<string, string>,
  timeoutMs: number,
): Promise<{ process: AppProcess; base: string }> {
  const p = startAppProcess(name, 'server/main/index.ts', { PORT: '0', HOST: '127.0.0.1', ...env })
  const [, base] = await waitForOutput(p, /ready at (http:\/\/127\.0\.0\.1:\d+)/, timeoutMs)
  return { process: p, base: base! }
}

/**
 * Stops the processes: SIGTERM (a clean shutdown), then SIGKILL for any still running after
 * `graceMs`. Safe to call with processes that already ended.
 */
export async function stopAppProcesses(list: readonly AppProcess[], graceMs = 10_000) {
  const running = list.filter((p) => p.child.exitCode === null && p.child.signalCode === null)
  const ended = running.map(
    (p) => new Promise<void>((resolve) => p.child.once('exit', () => resolve())),
  )
  for (const p of running) p.child.kill('SIGTERM')
  const timer = setTimeout(() => {
    for (const p of running) if (p.child.exitCode === null) p.child.kill('SIGKILL')
  }, graceMs)
  await Promise.all(ended)
  clearTimeout(timer)
}
