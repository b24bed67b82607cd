import request from 'supertest'
import type { Response } from 'supertest'
import type { Express } from 'express'
import { beforeAll } from 'vitest'
import { buildApp } from '../../../server/main/app'
import { DEMO_PASSWORD } from '../../../server/seed/demoUsers'
import { redisConnection, redisPrefix } from '../../../server/redis'

let app: Express | undefined

/** One app for the whole test file; it is built without listening, as supertest wants. */
export function testApp(): Express {
  app ??= buildApp()
  return app
}

type Body = string | object | undefined

/**
 * A browser-like client: keeps the session cookie and sends the CSRF token on every
 * state-changing request, refetching it after sign-in and sign-out as the real client does.
 */
export class TestClient {
  #agent: ReturnType<typeof request.agent> | undefined
  csrf = ''

  /** Made on first use, so a client may be declared before the app is built. */
  get agent(): ReturnType<typeof request.agent> {
    this.#agent ??= request.agent(testApp())
    return this.#agent
  }

  async refreshCsrf(): Promise<string> {
    const res = await this.agent.get('/api/auth/csrf').expect(200)
    this.csrf = (res.body as { csrfToken: string }).csrfToken
    return this.csrf
  }

  get(path: string) {
    return this.agent.get(path)
  }

  send(method: 'post' | 'patch' | 'put' | 'delete', path: string, body?: Body) {
    const req = this.agent[method](path).set('X-CSRF-Token', this.csrf)
    return body === undefined ? req : req.send(body)
  }

  post(path: string, body?: Body) {
    return this.send('post', path, body)
  }

  patch(path: string, body?: Body) {
    return this.send('patch', path, body)
  }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<Response> {
    await this.refreshCsrf()
    const res = await this.post('/api/auth/login', { email, password })
    if (res.status === 200) await this.refreshCsrf()
    return res
  }
}

async function signInAsRole(client: TestClient, role: string): Promise<TestClient> {
  const res = await client.signIn(`${role}@ferncastle.example`)
  if (res.status !== 200)
    throw new Error(`sign-in as ${role} failed: ${res.status} ${JSON.stringify(res.body)}`)
  return client
}

/** A client already signed in as the demo user of `role`. */
export async function signedInAs(role: string): Promise<TestClient> {
  return signInAsRole(new TestClient(), role)
}

/** The roles that make a lot and take it across the floor (`releasedTestLot` wants the first three). */
export const LOT_ROLES = ['engineer', 'lead', 'stores', 'operator'] as const

/**
 * One client per demo role, all signed in at once after the sign-in limits are cleared, so an
 * earlier file's failed attempts cannot lock them out.
 */
export async function signInRoles<R extends string>(...roles: R[]): Promise<Record<R, TestClient>> {
  await resetSignInLimits()
  const clients = await Promise.all(roles.map(signedInAs))
  return Object.fromEntries(roles.map((role, i) => [role, clients[i]!])) as Record<R, TestClient>
}

/**
 * For a describe block (or a file): one client per demo role, usable in its hooks and tests.
 * The clients are signed in as `signInRoles` does, by a `beforeAll` registered here, so they
 * are ready before the hooks registered after this call run.
 */
export function signedInRoles<R extends string>(...roles: R[]): Record<R, TestClient> {
  const clients = Object.fromEntries(roles.map((role) => [role, new TestClient()])) as Record<
    R,
    TestClient
  >
  beforeAll(async () => {
    await resetSignInLimits()
    await Promise.all(roles.map((role) => signInAsRole(clients[role], role)))
  })
  return clients
}

/** Clears the sign-in rate-limit counters, so one test file's failures do not lock out the next. */
export async function resetSignInLimits(): Promise<void> {
  const redis = redisConnection()
  const keys = await redis.keys(`${redisPrefix}:rl:*`)
  if (keys.length) await redis.del(...keys)
}

/** A short random suffix for codes and e-mails that must be unique across runs. */
export function uniqueSuffix(): string {
  return Math.random().toString(36).slice(2, 8).toUpperCase()
}
