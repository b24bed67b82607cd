// `npm test`: services, a fresh test database, checks, client build, then unit, api, faults, e2e.
// The last line printed is always `tests: N passed, M failed`.
import { ensurePackages } from './lib/debian'
import { ServiceError } from './lib/proc'
import { testRunEnv } from './lib/serviceConfig'
import type { ServiceConfig } from './lib/serviceConfig'
import { startServices } from './lib/services'
import { bin, flagValue, prepareDatabase, runStep } from './lib/steps'
import type { Phase } from './lib/vitestRun'
import { PHASES, runVitestPhase } from './lib/vitestRun'

const HELP = `usage: npm test [-- --only unit|api|faults|e2e[,…]] [-- --skip-checks]

Starts the services, resets and seeds the "waymark_test" database (waymark_laneN_test with
WAYMARK_TEST_LANE=N, for a second checkout testing at the same time), runs typecheck and lint,
builds the client (the e2e tests serve dist/), then vitest's unit, api, faults and e2e
projects. The faults phase stops and kills PostgreSQL and Redis of a stack of its own, started
on free ports; it never touches the shared services.
Exits non-zero when any test or step fails or no test ran.

  --only <phases>  run only these phases (comma-separated); unit skips the database
  --skip-checks    skip typecheck and lint`

interface StepResult {
  name: string
  exitCode: number
}

async function run(
  argv: string[],
): Promise<{ passed: number; failed: number; steps: StepResult[] }> {
  const only = flagValue(argv, '--only')
  const phases = only ? (only.split(',') as Phase[]) : [...PHASES]
  const unknown = phases.filter((p) => !PHASES.includes(p))
  if (unknown.length > 0) throw new ServiceError(`--only: unknown phase ${unknown.join(', ')}`)
  const steps: StepResult[] = []
  let passed = 0
  let failed = 0
  const step = async (name: string, exitCode: Promise<number> | number) => {
    const code = await exitCode
    steps.push({ name, exitCode: code })
    return code === 0
  }

  let config: ServiceConfig
  try {
    config = (await startServices()).config
    if (phases.includes('e2e')) await ensurePackages(['chromium'])
  } catch (err) {
    console.error(err instanceof ServiceError ? `test: ${err.message}` : err)
    steps.push({ name: 'services', exitCode: 1 })
    return { passed, failed: failed + 1, steps }
  }
  const env = testRunEnv(config)

  // The faults phase makes a database of its own (tests/faults/support/stack.ts).
  const usesDb = (p: Phase) => p !== 'unit' && p !== 'faults'
  const needsDb = phases.some(usesDb)
  const isDbReady =
    !needsDb || (await step('database', prepareDatabase(config, env, ['--reset'], [])))
  if (!argv.includes('--skip-checks')) {
    await step(
      'typecheck',
      runStep('typecheck', config, 'npm', ['run', '--silent', 'typecheck'], env),
    )
    await step('lint', runStep('lint', config, 'npm', ['run', '--silent', 'lint'], env))
  }
  const isBuilt =
    !phases.includes('e2e') ||
    (await step(
      'build',
      // A production bundle, as users get it, whatever NODE_ENV the tests run under.
      runStep('build client', config, bin(config, 'vite'), ['build'], {
        ...env,
        NODE_ENV: 'production',
      }),
    ))

  for (const phase of phases) {
    if (usesDb(phase) && !isDbReady) {
      console.log(`\n==> vitest ${phase}: skipped (database not ready)`)
      continue
    }
    if (phase === 'e2e' && !isBuilt) {
      console.log('\n==> vitest e2e: skipped (client build failed)')
      continue
    }
    const result = await runVitestPhase(config, phase, env)
    steps.push({
      name: `vitest ${phase} (${result.passed} passed, ${result.failed} failed)`,
      exitCode: result.exitCode,
    })
    passed += result.passed
    failed += result.failed
  }
  // A failed step that is not a test run (typecheck, lint, build, database) is one failure.
  failed += steps.filter((s) => s.exitCode !== 0 && !s.name.startsWith('vitest')).length
  return { passed, failed, steps }
}

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(HELP)
    return 0
  }
  let outcome: Awaited<ReturnType<typeof run>>
  try {
    outcome = await run(argv)
  } catch (err) {
    console.error(err instanceof ServiceError ? `test: ${err.message}` : err)
    outcome = { passed: 0, failed: 1, steps: [{ name: 'test runner', exitCode: 1 }] }
  }
  const { passed, failed, steps } = outcome
  console.log('\n==> summary')
  for (const s of steps) console.log(`  ${s.exitCode === 0 ? 'ok    ' : 'FAILED'}  ${s.name}`)
  if (passed === 0) console.log('  no test passed: that counts as a failed run')
  console.log(`tests: ${passed} passed, ${failed} failed`)
  return failed > 0 || passed === 0 || steps.some((s) => s.exitCode !== 0) ? 1 : 0
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err)
    console.log('tests: 0 passed, 1 failed')
    process.exit(1)
  },
)
