import type { ChildProcess } from 'node:child_process'
import { spawn } from 'node:child_process'
import { constants } from 'node:os'

export interface ChildSpec {
  name: string
  cmd: string
  args: string[]
  env: NodeJS.ProcessEnv
  cwd: string
}

const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const

/**
 * Runs long-lived children until one exits or we get a signal, then stops the rest and
 * resolves with the first child's exit code. Each child gets its own process group so that
 * Ctrl-C reaches it once, forwarded by us, rather than twice (terminal and forward); stdin
 * is closed because a background process group reading the terminal would be stopped.
 */
export function supervise(specs: ChildSpec[]): Promise<number> {
  return new Promise((resolvePromise) => {
    const running = new Map<string, ChildProcess>()
    let exitCode: number | null = null
    let isStopping = false

    const stopAll = (signal: NodeJS.Signals) => {
      isStopping = true
      for (const child of running.values()) child.kill(signal)
      // A child that ignores the signal must not keep us alive forever.
      setTimeout(() => {
        for (const child of running.values()) child.kill('SIGKILL')
      }, 10000).unref()
    }
    const onSignal = (signal: NodeJS.Signals) => stopAll(signal)
    const onExit = () => {
      for (const child of running.values()) child.kill('SIGTERM')
    }
    for (const signal of SIGNALS) process.on(signal, onSignal)
    process.on('exit', onExit)

    const finished = (name: string, code: number) => {
      if (!running.delete(name)) return
      if (!isStopping) {
        console.error(`${name}: exited with code ${code}`)
        stopAll('SIGTERM')
      }
      exitCode ??= code
      if (running.size > 0) return
      for (const signal of SIGNALS) process.off(signal, onSignal)
      process.off('exit', onExit)
      resolvePromise(exitCode)
    }

    for (const spec of specs) {
      const child = spawn(spec.cmd, spec.args, {
        cwd: spec.cwd,
        env: spec.env,
        detached: true,
        stdio: ['ignore', 'inherit', 'inherit'],
      })
      running.set(spec.name, child)
      child.on('error', (err) => {
        console.error(`${spec.name}: ${err.message}`)
        finished(spec.name, 127)
      })
      child.on('exit', (code, signal) => {
        finished(spec.name, code ?? 128 + (signal ? constants.signals[signal] : 0))
      })
    }
  })
}
