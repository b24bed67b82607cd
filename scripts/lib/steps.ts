import { join } from 'node:path'
import type { ServiceConfig } from './serviceConfig'
import { runInherit } from './proc'

/** Path of a package binary in node_modules/.bin (its real pid, unlike going through npx). */
export function bin(config: ServiceConfig, name: string): string {
  return join(config.repoRoot, 'node_modules', '.bin', name)
}

/** Prints a header, runs the command with the terminal attached, and returns its exit code. */
export async function runStep(
  label: string,
  config: ServiceConfig,
  cmd: string,
  args: string[],
  env: NodeJS.ProcessEnv,
): Promise<number> {
  console.log(`\n==> ${label}`)
  const started = Date.now()
  const code = await runInherit(cmd, args, env, config.repoRoot)
  const seconds = ((Date.now() - started) / 1000).toFixed(1)
  console.log(
    code === 0
      ? `==> ${label}: ok (${seconds}s)`
      : `==> ${label}: FAILED (exit ${code}, ${seconds}s)`,
  )
  return code
}

/** Runs migrate then seed for env.WAYMARK_DB; returns the first non-zero exit code, or 0. */
export async function prepareDatabase(
  config: ServiceConfig,
  env: NodeJS.ProcessEnv,
  migrateArgs: string[],
  seedArgs: string[],
): Promise<number> {
  const tsx = bin(config, 'tsx')
  const db = env.WAYMARK_DB ?? '?'
  const migrated = await runStep(
    `migrate ${db}`,
    config,
    tsx,
    ['scripts/migrate.ts', ...migrateArgs],
    env,
  )
  if (migrated !== 0) return migrated
  return runStep(`seed ${db}`, config, tsx, ['scripts/seed.ts', ...seedArgs], env)
}

/** Parses `--name value` and `--name=value`; returns undefined when absent. */
export function flagValue(argv: string[], name: string): string | undefined {
  const i = argv.indexOf(name)
  if (i >= 0) return argv[i + 1]
  const eq = argv.find((a) => a.startsWith(`${name}=`))
  return eq?.slice(name.length + 1)
}
