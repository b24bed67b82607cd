// What the benchmark scripts share: serving the app on loopback, signing in as a demo user, and
// reading percentiles off sorted timings.
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import type { Express } from 'express'
import { DEMO_PASSWORD } from '../../server/seed/demoUsers'

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
