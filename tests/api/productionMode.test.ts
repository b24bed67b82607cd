import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import type { AddressInfo } from 'node:net'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { resetSignInLimits } from './support/client'

// The production build as `npm start` serves it: a separate process with NODE_ENV=production,
// signed in over plain-http loopback and through a TLS proxy's X-Forwarded-Proto header (the
// proxy named in TRUST_PROXY).
function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as AddressInfo
      s.close(() => resolve(port))
    })
  })
}

describe('production mode', () => {
  let child: ChildProcess
  let base = ''

  beforeAll(async () => {
    await resetSignInLimits()
    const port = await freePort()
    base = `http://127.0.0.1:${port}`
    child = spawn('node_modules/.bin/tsx', ['server/main/index.ts'], {
      env: {
        ...process.env,
        NODE_ENV: 'production',
        // The proxy in front of the app runs on this host; without this the header is ignored.
        TRUST_PROXY: 'loopback',
        PORT: String(port),
        HOST: '127.0.0.1',
        WAYMARK_WORKERS: 'off',
        LOG_LEVEL: 'error',
      },
      stdio: 'ignore',
    })
    for (let i = 0; i < 100; i++) {
      const ok = await fetch(`${base}/api/health`).then(
        (r) => r.ok,
        () => false,
      )
      if (ok) return
      await new Promise((r) => setTimeout(r, 200))
    }
    throw new Error('the production server did not start')
  }, 30_000)

  afterAll(() => {
    child?.kill('SIGTERM')
  })

  async function signIn(headers: Record<string, string>) {
    const csrf = await fetch(`${base}/api/auth/csrf`, { headers })
    const cookie = csrf.headers.get('set-cookie')!
    const { csrfToken } = (await csrf.json()) as { csrfToken: string }
    const login = await fetch(`${base}/api/auth/login`, {
      method: 'POST',
      headers: {
        ...headers,
        'content-type': 'application/json',
        cookie: cookie.split(';')[0]!,
        'x-csrf-token': csrfToken,
      },
      body: JSON.stringify({ email: 'lead@ferncastle.example', password: 'waymark-demo' }),
    })
    return { first: cookie, login }
  }

  it('signs in over plain http on loopback (the npm start demo)', async () => {
    const { first, login } = await signIn({})
    expect(first).not.toMatch(/;\s*Secure/i)
    expect(login.status).toBe(200)
  })

  it('marks the session cookie Secure behind a TLS proxy', async () => {
    const { first, login } = await signIn({ 'x-forwarded-proto': 'https' })
    expect(first).toMatch(/;\s*Secure/i)
    expect(first).toMatch(/HttpOnly/i)
    expect(login.status).toBe(200)
    expect(login.headers.get('set-cookie')).toMatch(/;\s*Secure/i)
  })
})
