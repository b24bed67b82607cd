import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { ServiceConfig } from './serviceConfig'
import { bin, runStep } from './steps'

export type Phase = 'unit' | 'api' | 'faults' | 'e2e'
export const PHASES: readonly Phase[] = ['unit', 'api', 'faults', 'e2e']

/** vitest projects per phase; `unit-dom` holds the component tests under tests/unit/src. */
const PROJECTS: Record<Phase, string[]> = {
  unit: ['unit', 'unit-dom'],
  api: ['api'],
  faults: ['faults'],
  e2e: ['e2e'],
}

export interface PhaseResult {
  phase: Phase
  exitCode: number
  passed: number
  failed: number
}

/**
 * Runs one phase's vitest projects with the count reporter. A non-zero exit with no failed
 * test counted (a crash, a config error, a failing hook) still counts as one failure.
 */
export async function runVitestPhase(
  config: ServiceConfig,
  phase: Phase,
  env: NodeJS.ProcessEnv,
): Promise<PhaseResult> {
  const dir = mkdtempSync(join(tmpdir(), 'waymark-counts-'))
  const countFile = join(dir, `${phase}.json`)
  const args = ['run', ...PROJECTS[phase].flatMap((p) => ['--project', p]), '--passWithNoTests']
  args.push('--reporter=default', '--reporter=./tests/support/countReporter.ts')
  try {
    const exitCode = await runStep(`vitest ${phase}`, config, bin(config, 'vitest'), args, {
      ...env,
      WAYMARK_COUNT_FILE: countFile,
    })
    let passed = 0
    let failed = 0
    if (existsSync(countFile)) {
      const counts = JSON.parse(readFileSync(countFile, 'utf8')) as {
        passed: number
        failed: number
      }
      passed = counts.passed
      failed = counts.failed
    }
    if (exitCode !== 0 && failed === 0) failed = 1
    return { phase, exitCode, passed, failed }
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}
