import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/roles'
import type { Role } from '../../shared/roles'
import { apiRouters, registeredRoutes } from '../../server/routes/registry'
import { resetSignInLimits, signedInAs, TestClient, testApp } from './support/client'

type Who = 'public' | 'signed_in' | readonly Role[]

const TRACE: Who = ['service', 'lead', 'engineer', 'admin']

/**
 * Who may call each route, written out by hand. Adding a route to the server without adding it
 * here fails the first test; a route whose guard differs from this table fails the second.
 */
const EXPECTED: { method: string; path: string; who: Who }[] = [
  { method: 'get', path: '/api/auth/csrf', who: 'public' },
  { method: 'post', path: '/api/auth/login', who: 'public' },
  { method: 'post', path: '/api/auth/logout', who: 'public' },
  { method: 'get', path: '/api/auth/me', who: 'signed_in' },
  { method: 'put', path: '/api/auth/pin', who: 'signed_in' },
  { method: 'post', path: '/api/auth/badge', who: 'signed_in' },
  { method: 'get', path: '/api/health', who: 'public' },
  { method: 'get', path: '/api/stations', who: 'signed_in' },
  { method: 'post', path: '/api/stations', who: ['admin'] },
  { method: 'patch', path: '/api/stations/:id', who: ['admin'] },
  { method: 'get', path: '/api/users', who: ['admin'] },
  { method: 'post', path: '/api/users', who: ['admin'] },
  { method: 'patch', path: '/api/users/:id', who: ['admin'] },
  { method: 'post', path: '/api/users/:id/badge', who: ['admin'] },
  { method: 'get', path: '/api/audit-events', who: ['admin'] },
  // Draft revisions (in this list, GET /revisions/:id and its /bom) only for PERMISSIONS
  // .readDraftRecipes (engineer, lead, admin); others get released/obsolete ones and a 404 for a
  // draft: tested in security.test.ts, since this table checks 401/403 only.
  { method: 'get', path: '/api/products', who: 'signed_in' },
  { method: 'post', path: '/api/products', who: ['engineer'] },
  { method: 'patch', path: '/api/products/:id', who: ['engineer'] },
  { method: 'post', path: '/api/products/:id/revisions', who: ['engineer'] },
  { method: 'get', path: '/api/revisions/:id', who: 'signed_in' },
  { method: 'patch', path: '/api/revisions/:id', who: ['engineer'] },
  { method: 'delete', path: '/api/revisions/:id', who: ['engineer'] },
  { method: 'get', path: '/api/revisions/:id/release-check', who: ['engineer', 'lead', 'admin'] },
  { method: 'post', path: '/api/revisions/:id/release', who: ['engineer'] },
  { method: 'post', path: '/api/revisions/:id/obsolete', who: ['engineer'] },
  { method: 'post', path: '/api/revisions/:id/copy', who: ['engineer'] },
  { method: 'post', path: '/api/revisions/:id/windings', who: ['engineer'] },
  { method: 'post', path: '/api/revisions/:id/steps', who: ['engineer'] },
  { method: 'put', path: '/api/revisions/:id/steps/order', who: ['engineer'] },
  { method: 'get', path: '/api/revisions/:id/bom', who: 'signed_in' },
  { method: 'post', path: '/api/revisions/:id/bom', who: ['engineer'] },
  { method: 'patch', path: '/api/steps/:id', who: ['engineer'] },
  { method: 'delete', path: '/api/steps/:id', who: ['engineer'] },
  { method: 'post', path: '/api/steps/:id/checks', who: ['engineer'] },
  { method: 'patch', path: '/api/checks/:id', who: ['engineer'] },
  { method: 'delete', path: '/api/checks/:id', who: ['engineer'] },
  { method: 'patch', path: '/api/windings/:id', who: ['engineer'] },
  { method: 'delete', path: '/api/windings/:id', who: ['engineer'] },
  { method: 'patch', path: '/api/bom-lines/:id', who: ['engineer'] },
  { method: 'delete', path: '/api/bom-lines/:id', who: ['engineer'] },
  { method: 'get', path: '/api/parts', who: ['engineer', 'stores', 'lead', 'admin'] },
  { method: 'post', path: '/api/parts', who: ['engineer', 'stores'] },
  { method: 'patch', path: '/api/parts/:id', who: ['engineer', 'stores'] },
  { method: 'get', path: '/api/defect-codes', who: 'signed_in' },
  { method: 'post', path: '/api/defect-codes', who: ['engineer'] },
  { method: 'patch', path: '/api/defect-codes/:id', who: ['engineer'] },
  {
    method: 'get',
    path: '/api/component-lots',
    who: ['stores', 'lead', 'admin', 'engineer', 'service'],
  },
  { method: 'post', path: '/api/component-lots', who: ['stores'] },
  {
    method: 'get',
    path: '/api/component-lots/:id',
    who: ['stores', 'lead', 'admin', 'engineer', 'service'],
  },
  { method: 'patch', path: '/api/component-lots/:id', who: ['stores'] },
  { method: 'post', path: '/api/component-lots/:id/status', who: ['stores', 'lead'] },
  { method: 'post', path: '/api/component-lots/:id/inspection', who: ['stores'] },
  {
    method: 'get',
    path: '/api/suppliers',
    who: ['stores', 'lead', 'admin', 'engineer', 'service'],
  },
  { method: 'post', path: '/api/suppliers', who: ['stores'] },
  { method: 'put', path: '/api/component-lots/:id/certificate', who: ['stores'] },
  {
    method: 'get',
    path: '/api/component-lots/:id/certificate',
    who: ['stores', 'lead', 'admin', 'engineer', 'service'],
  },
  { method: 'get', path: '/api/component-lots/:id/label.pdf', who: ['stores', 'lead', 'admin'] },
  { method: 'get', path: '/api/lots', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'post', path: '/api/lots', who: ['lead'] },
  { method: 'get', path: '/api/lots/:id', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'patch', path: '/api/lots/:id', who: ['lead'] },
  { method: 'post', path: '/api/lots/:id/release', who: ['lead'] },
  { method: 'post', path: '/api/lots/:id/hold', who: ['lead'] },
  { method: 'post', path: '/api/lots/:id/unhold', who: ['lead'] },
  { method: 'post', path: '/api/lots/:id/close', who: ['lead'] },
  { method: 'get', path: '/api/lots/:id/units', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'get', path: '/api/lots/:id/grid', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'get', path: '/api/lots/:id/documents', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'post', path: '/api/lots/:id/documents', who: ['lead'] },
  { method: 'get', path: '/api/documents/:id', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'get', path: '/api/documents/:id/file', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'get', path: '/api/outbox', who: ['admin', 'service'] },
  { method: 'get', path: '/api/outbox/:id', who: ['admin', 'service'] },
  { method: 'get', path: '/api/outbox/:id/attachments/:index', who: ['admin', 'service'] },
  {
    method: 'get',
    path: '/api/floor/units/:serial',
    who: ['operator', 'lead', 'engineer', 'admin'],
  },
  {
    method: 'get',
    path: '/api/floor/component-lots/:code',
    who: ['operator', 'lead', 'engineer', 'admin'],
  },
  {
    method: 'get',
    path: '/api/floor/stations/:code/recent',
    who: ['operator', 'lead', 'engineer', 'admin'],
  },
  {
    method: 'get',
    path: '/api/floor/stations/:code/waiting',
    who: ['operator', 'lead', 'engineer', 'admin'],
  },
  {
    method: 'get',
    path: '/api/floor/units/:serial/where',
    who: ['operator', 'lead', 'engineer', 'admin'],
  },
  { method: 'post', path: '/api/step-runs', who: ['operator', 'lead', 'engineer'] },
  { method: 'get', path: '/api/nonconformances', who: ['lead', 'engineer', 'admin', 'service'] },
  { method: 'post', path: '/api/nonconformances/:id/disposition', who: ['lead', 'engineer'] },
  { method: 'get', path: '/api/yield/summary', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/yield/lots/:id', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/alerts', who: ['lead', 'engineer', 'admin'] },
  { method: 'post', path: '/api/alerts/acknowledge', who: ['lead'] },
  { method: 'post', path: '/api/alerts/:id/acknowledge', who: ['lead'] },
  { method: 'get', path: '/api/imports', who: ['lead', 'engineer'] },
  { method: 'post', path: '/api/imports', who: ['lead', 'engineer'] },
  { method: 'get', path: '/api/imports/:id', who: ['lead', 'engineer'] },
  { method: 'get', path: '/api/imports/:id/rows', who: ['lead', 'engineer'] },
  { method: 'post', path: '/api/imports/:id/dry-run', who: ['lead', 'engineer'] },
  { method: 'post', path: '/api/imports/:id/run', who: ['lead', 'engineer'] },
  { method: 'get', path: '/api/stations/:code/import-mapping', who: ['lead', 'engineer'] },
  { method: 'put', path: '/api/stations/:code/import-mapping', who: ['lead', 'engineer'] },
  { method: 'get', path: '/api/customers', who: ['lead', 'service', 'admin', 'engineer'] },
  { method: 'post', path: '/api/customers', who: ['lead', 'service', 'admin'] },
  { method: 'get', path: '/api/customers/:id', who: ['lead', 'service', 'admin', 'engineer'] },
  { method: 'patch', path: '/api/customers/:id', who: ['lead', 'service', 'admin'] },
  { method: 'get', path: '/api/shipments', who: ['lead', 'service', 'admin', 'engineer'] },
  { method: 'post', path: '/api/shipments', who: ['lead', 'service'] },
  { method: 'get', path: '/api/shipments/units/:serial', who: ['lead', 'service'] },
  { method: 'get', path: '/api/shipments/:id', who: ['lead', 'service', 'admin', 'engineer'] },
  { method: 'post', path: '/api/shipments/:id/certificate', who: ['service', 'lead', 'admin'] },
  { method: 'post', path: '/api/units/:serial/certificate', who: ['service', 'lead', 'admin'] },
  {
    method: 'get',
    path: '/api/units/:serial/documents',
    who: ['lead', 'service', 'admin', 'engineer'],
  },
  {
    method: 'get',
    path: '/api/documents/:id/email-draft',
    who: ['service', 'lead', 'admin', 'engineer'],
  },
  {
    method: 'post',
    path: '/api/documents/:id/email',
    who: ['service', 'lead', 'admin', 'engineer'],
  },
  { method: 'get', path: '/api/service-cases', who: ['service', 'lead', 'engineer', 'admin'] },
  { method: 'post', path: '/api/service-cases', who: ['service', 'lead'] },
  { method: 'get', path: '/api/service-cases/units/:serial', who: ['service', 'lead'] },
  { method: 'get', path: '/api/service-cases/:id', who: ['service', 'lead', 'engineer', 'admin'] },
  { method: 'patch', path: '/api/service-cases/:id', who: ['service', 'lead'] },
  { method: 'post', path: '/api/service-cases/:id/close', who: ['service', 'lead'] },
  { method: 'patch', path: '/api/outbox/:id', who: ['service', 'admin'] },
  { method: 'post', path: '/api/outbox/:id/send', who: ['service', 'admin'] },
  { method: 'post', path: '/api/outbox/:id/retry', who: ['admin', 'service'] },
  { method: 'get', path: '/api/search', who: 'signed_in' },
  { method: 'get', path: '/api/status', who: ['admin'] },
  { method: 'get', path: '/api/trace/units/:serial', who: TRACE },
  { method: 'get', path: '/api/trace/units/:serial/history.json', who: TRACE },
  { method: 'get', path: '/api/trace/units/:serial/history.pdf', who: TRACE },
  { method: 'get', path: '/api/trace/component-lots/:code', who: TRACE },
  { method: 'post', path: '/api/trace/component-lots/:code/contain', who: ['lead'] },
  { method: 'post', path: '/api/trace/component-lots/:code/end-containment', who: ['lead'] },
  { method: 'get', path: '/api/trace/units/:serial/containment', who: TRACE },
  {
    method: 'post',
    path: '/api/trace/units/:serial/containment-decision',
    who: ['lead', 'engineer'],
  },
  { method: 'get', path: '/api/yield/lots/:id/detail', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/yield/lots/:id/turns', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/yield/lots/:id/statistics', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/yield/statistics', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/exports/lots', who: ['lead', 'engineer', 'admin'] },
  { method: 'get', path: '/api/exports/lots/:id/measurements', who: ['lead', 'engineer', 'admin'] },
]

const key = (r: { method: string; path: string }) => `${r.method.toUpperCase()} ${r.path}`

function expectedStatusClass(who: Who, role: Role | null): 'open' | 401 | 403 {
  if (who === 'public') return 'open'
  if (role === null) return 401
  if (who === 'signed_in' || who.includes(role)) return 'open'
  return 403
}

async function freshAnonymous(): Promise<TestClient> {
  const client = new TestClient()
  await client.refreshCsrf()
  return client
}

describe('role matrix', () => {
  beforeAll(async () => {
    testApp()
    await resetSignInLimits()
  })

  it('has a rule in this table for every route the server registers, and no stale rows', () => {
    expect(registeredRoutes.map(key).sort()).toEqual(EXPECTED.map(key).sort())
  })

  it('registers no route on an API router without going through the guarded registry', () => {
    const guarded = registeredRoutes.length
    let layers = 0
    for (const { router } of apiRouters)
      for (const layer of router.stack as { route?: { methods: Record<string, boolean> } }[])
        if (layer.route)
          layers += Object.keys(layer.route.methods).filter((m) => m !== '_all').length
    expect(layers).toBe(guarded)
  })

  it('finds every route only through the registry: no all(), no nested router, none on the app', () => {
    type Layer = {
      route?: { path: unknown; methods: Record<string, boolean> }
      handle?: { stack?: unknown }
    }
    const seen: string[] = []
    for (const { base, router } of apiRouters)
      for (const layer of router.stack as Layer[]) {
        // A router.use() inside an API router could mount routes this table never sees.
        if (!layer.route) {
          expect(layer.handle?.stack, `a router mounted inside /api${base}`).toBeUndefined()
          continue
        }
        const path = String(layer.route.path)
        // `_all` (router.all) is kept: it would match no row and fail here.
        for (const m of Object.keys(layer.route.methods))
          seen.push(key({ method: m, path: `/api${base}${path === '/' ? '' : path}` }))
      }
    expect(seen.sort()).toEqual(registeredRoutes.map(key).sort())
    const app = testApp() as unknown as { router: { stack: Layer[] } }
    const onApp = app.router.stack.filter((l) => l.route && /^\/api\b/.test(String(l.route.path)))
    expect(onApp).toEqual([])
  })

  it('guards HEAD like the GET it stands for', async () => {
    const anonymous = await freshAnonymous()
    const failures: string[] = []
    for (const row of EXPECTED) {
      if (row.method !== 'get' || row.who === 'public') continue
      const res = await anonymous.agent.head(row.path.replace(/:\w+/g, randomUUID()))
      if (res.status !== 401) failures.push(`HEAD ${row.path}: got ${res.status}`)
    }
    expect(failures).toEqual([])
  })

  it(
    'answers every route × role with the status its rule implies',
    { timeout: 240_000 },
    async () => {
      const clients = new Map<Role, TestClient>()
      for (const role of ROLES) clients.set(role, await signedInAs(role))
      const anonymous = await freshAnonymous()
      const failures: string[] = []
      for (const row of EXPECTED) {
        const path = row.path.replace(/:\w+/g, randomUUID())
        for (const role of [null, ...ROLES] as (Role | null)[]) {
          // Signing out ends the session, so that row gets a client of its own.
          const client =
            row.path !== '/api/auth/logout'
              ? role
                ? clients.get(role)!
                : anonymous
              : role
                ? await signedInAs(role)
                : await freshAnonymous()
          const res =
            row.method === 'get'
              ? await client.get(path)
              : await client.send(row.method as 'post' | 'patch' | 'put' | 'delete', path, {})
          const want = expectedStatusClass(row.who, role)
          const isOk =
            want === 'open' ? res.status !== 401 && res.status !== 403 : res.status === want
          if (!isOk)
            failures.push(`${key(row)} as ${role ?? 'anonymous'}: got ${res.status}, want ${want}`)
        }
      }
      expect(failures).toEqual([])
    },
  )
})
