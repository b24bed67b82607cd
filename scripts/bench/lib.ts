// What the benchmark scripts share: serving the app on loopback, signing in as a demo user, and
// reading percentiles off sorted timings.
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import type { Express } from 'express'
import type { Sequelize } from 'sequelize'
import { DEMO_PASSWORD } from '../../server/seed/demoUsers'

/**
 * Points this process at the bench database, quiet logs and a Redis prefix of its own, where the
 * environment does not name others: `extra` adds or overrides defaults (a soak's own prefix and
 * bucket). Call it before the first dynamic import of the server, which reads the environment.
 */
export function benchEnvironment(extra: Record<string, string> = {}): void {
  const defaults: Record<string, string> = {
    WAYMARK_DB: 'waymark_bench_test',
    NODE_ENV: 'test',
    WAYMARK_REDIS_PREFIX: 'waymark-bench',
    LOG_LEVEL: 'error',
    ...extra,
  }
  for (const [name, value] of Object.entries(defaults)) process.env[name] ??= value
}

/**
 * Empties WAYMARK_DB (unless `keep`, to measure an earlier run's data again) and migrates it, as
 * the owner; `then` may add tables of the bench's own on the same connection. The server is
 * imported here, after benchEnvironment has set what it reads.
 */
export async function migrateBenchDatabase(
  options: { keep?: boolean; then?: (owner: Sequelize) => Promise<unknown> } = {},
): Promise<void> {
  const { migrator, ownerConnection, resetTestSchema } = await import('../../server/db/migrator')
  const owner = ownerConnection()
  try {
    if (!options.keep) await resetTestSchema(owner)
    await migrator(owner).up()
    await options.then?.(owner)
  } finally {
    await owner.close()
  }
}

/** Serves `app` on a free loopback port. */
export async function listenOnLoopback(app: Express): Promise<{ server: Server; base: string }> {
  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s))
  })
  return { server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }
}

const cookieOf = (res: Response) => res.headers.get('set-cookie')!.split(';')[0]!

async function csrfToken(base: string, cookie?: string): Promise<{ res: Response; token: string }> {
  const res = await fetch(`${base}/api/auth/csrf`, { headers: cookie ? { cookie } : {} })
  return { res, token: ((await res.json()) as { csrfToken: string }).csrfToken }
}

/**
 * Signs in through the API as the demo user `email`, as the client does; returns the session
 * cookie and the CSRF token that state-changing requests must send.
 */
export async function signIn(
  base: string,
  email: string,
): Promise<{ cookie: string; token: string }> {
  const first = await csrfToken(base)
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      cookie: cookieOf(first.res),
      'x-csrf-token': first.token,
    },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  })
  if (!login.ok) throw new Error(`sign-in as ${email} failed: ${login.status}`)
  const cookie = cookieOf(login)
  // Signing in regenerates the session, and with it the token.
  return { cookie, token: (await csrfToken(base, cookie)).token }
}

/** The p-th percentile (nearest rank) of timings sorted in ascending order. */
export function percentile(sorted: readonly number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? NaN
}
