import { randomUUID } from 'node:crypto'
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { z } from 'zod'
import { ROLES } from '../../shared/roles'
import type { Role } from '../../shared/roles'
import * as alerts from '../../shared/schemas/alerts'
import * as auth from '../../shared/schemas/auth'
import * as imports from '../../shared/schemas/imports'
import * as lots from '../../shared/schemas/lots'
import * as outbox from '../../shared/schemas/outbox'
import * as receiving from '../../shared/schemas/componentLots'
import * as recipes from '../../shared/schemas/recipes'
import * as shipping from '../../shared/schemas/shipping'
import * as stations from '../../shared/schemas/stations'
import * as trace from '../../shared/schemas/trace'
import * as users from '../../shared/schemas/users'
import type { RevisionDto } from '../../shared/schemas/recipes'
import type { RegisteredRoute } from '../../server/routes/registry'
import { registeredRoutes } from '../../server/routes/registry'
import { resetSignInLimits, signedInAs, TestClient, testApp, uniqueSuffix } from './support/client'
import { releasedTestLot } from './support/floor'
import type { TestLot } from './support/floor'
import { buildSmallRecipe } from './support/recipes'
import { tableSnapshot } from './support/rows'

/**
 * A property test over every POST, PATCH and PUT route of the registry: arbitrary and malformed
 * bodies never get a 5xx; a refusal is a JSON error (naming a field for 400, 413 and 415) and
 * leaves every app table as it was. Bounded: NUM_RUNS bodies per route, from a fixed seed (one
 * per route, so that routes do not all get the same sequence of shapes).
 */
const SEED = 20261217
const NUM_RUNS = 20

type Body = unknown

/** Every object key any shared input schema knows, so bodies hit real fields, not only junk. */
function schemaKeys(): string[] {
  const keys = new Set<string>()
  const seen = new Set<unknown>()
  const walk = (s: unknown): void => {
    if (!(s instanceof z.ZodType) || seen.has(s)) return
    seen.add(s)
    const def = (s as unknown as { _zod: { def: Record<string, unknown> } })._zod.def
    if (s instanceof z.ZodObject)
      for (const [k, v] of Object.entries(s.shape)) {
        keys.add(k)
        walk(v)
      }
    for (const part of ['element', 'innerType', 'valueType', 'in', 'out'] as const) walk(def[part])
    if (Array.isArray(def.options)) def.options.forEach(walk)
  }
  for (const mod of [alerts, auth, imports, lots, outbox, receiving, recipes, shipping, stations])
    Object.values(mod).forEach(walk)
  for (const mod of [trace, users]) Object.values(mod).forEach(walk)
  return [...keys].sort()
}

/** Text that PostgreSQL, JSON columns or a decoder choke on, when nothing refuses it first. */
const HOSTILE_STRINGS = [
  '\u0000',
  'a\u0000b',
  '\uD800',
  'x\uDFFF',
  '\uDFFF\uD800',
  '%E0%A4%A',
  '%ED%A0%80',
  '50%OFF',
  'ZZ%',
]
const EDGE_STRINGS = [
  '',
  ' ',
  'plug \uD83D\uDD0C',
  '\u202Eevil',
  '\uFEFFbom',
  'Ω µ ± °',
  "' OR 1=1 --",
  "'); DROP TABLE units; --",
  '1; SELECT pg_sleep(5)',
  '<script>alert(1)</script>',
  '<img src=x onerror=alert(1)>',
  '../../etc/passwd',
  'null',
  'NaN',
  '-1',
  '1e308',
  '2026-02-30',
  '9999-99-99',
  '2026-12-01',
  'WND-1',
  'winding',
  'numeric',
  'pass',
  'fail',
  'rework',
  'scrap',
  'admin',
  'lead@ferncastle.example',
  'http://127.0.0.1/u/FP24-2649-00017K',
]
const EDGE_NUMBERS = [
  0,
  -0,
  -1,
  1,
  0.5,
  2 ** 31,
  -(2 ** 31) - 1,
  2 ** 53 + 2,
  -(2 ** 63),
  1e21,
  1e308,
  -1e308,
  5e-324,
  99_999_999_999,
]

function arbitraries(knownKeys: string[], ids: string[]) {
  const string = fc.oneof(
    { weight: 3, arbitrary: fc.constantFrom(...HOSTILE_STRINGS) },
    { weight: 3, arbitrary: fc.constantFrom(...EDGE_STRINGS) },
    { weight: 2, arbitrary: fc.string({ unit: 'binary', maxLength: 30 }) },
    { weight: 1, arbitrary: fc.constantFrom('x'.repeat(5000), 'é'.repeat(120_000)) },
  )
  const number = fc.oneof(
    fc.constantFrom(...EDGE_NUMBERS),
    fc.integer(),
    fc.double({ noNaN: true, noDefaultInfinity: true }),
  )
  const leaf = fc.oneof(
    { weight: 4, arbitrary: string },
    { weight: 3, arbitrary: number },
    { weight: 1, arbitrary: fc.boolean() },
    { weight: 1, arbitrary: fc.constant(null) },
    { weight: 2, arbitrary: fc.constantFrom(...ids) },
  )
  const key = fc.oneof(
    { weight: 6, arbitrary: fc.constantFrom(...knownKeys) },
    { weight: 1, arbitrary: fc.string({ maxLength: 12 }) },
    { weight: 1, arbitrary: fc.constantFrom('__proto__', 'constructor', '\u0000', '\uD800', '') },
  )
  const { value } = fc.letrec((tie) => ({
    value: fc.oneof(
      { depthSize: 'small', maxDepth: 3 },
      leaf,
      fc.array(tie('value'), { maxLength: 4 }),
      fc.dictionary(key, tie('value'), { maxKeys: 4 }),
    ),
  }))
  const deep = fc.integer({ min: 100, max: 4000 }).map((depth) => {
    let v: unknown = { serial: 'x' }
    for (let i = 0; i < depth; i++) v = i % 2 ? [v] : { values: v }
    return v
  })
  const junk = fc.oneof(
    { weight: 6, arbitrary: fc.dictionary(key, value, { maxKeys: 8 }) },
    { weight: 1, arbitrary: deep },
    { weight: 1, arbitrary: fc.array(value, { maxLength: 5 }) },
    { weight: 1, arbitrary: fc.oneof(string, number, fc.boolean(), fc.constant(null)) },
  )
  /** A valid body with one or two fields (mostly its own) changed, dropped or added. */
  const mutated = (seed: Record<string, unknown>) =>
    fc
      .array(
        fc.tuple(
          fc.oneof(
            { weight: 4, arbitrary: fc.constantFrom(...Object.keys(seed)) },
            { weight: 1, arbitrary: fc.constantFrom(...knownKeys) },
          ),
          // One change in five drops the field; the others give it a new value.
          fc.integer({ min: 0, max: 4 }).map((n) => n === 0),
          fc.oneof({ weight: 4, arbitrary: leaf }, { weight: 1, arbitrary: value }),
        ),
        { minLength: 1, maxLength: 2 },
      )
      .map((changes) => {
        const body: Record<string, unknown> = { ...seed }
        for (const [k, drop, v] of changes)
          if (drop && k in body) delete body[k]
          else body[k] = v
        return body
      })
  return { junk, mutated }
}

interface Fixtures {
  t: TestLot
  draft: RevisionDto
  customerId: string
  componentLotId: string
}

/** Real ids for the path, from records this file made, so that the body is actually read. */
function pathFor(rule: RegisteredRoute, f: Fixtures): string {
  const step = f.draft.steps[0]!
  const byBase: Record<string, string> = {
    products: f.draft.productId,
    revisions: f.draft.id,
    steps: step.id,
    checks: step.checks[0]!.id,
    windings: f.draft.windings[0]!.id,
    'bom-lines': f.draft.bom[0]!.id,
    parts: f.draft.bom[0]!.partId,
    lots: f.t.lot.id,
    'component-lots': f.componentLotId,
    customers: f.customerId,
  }
  const base = rule.path.split('/')[2]!
  return rule.path.replace(/:(\w+)/g, (_m, name: string) => {
    if (name === 'serial') return f.t.units[0]!.serial
    if (name === 'code') return base === 'trace' ? f.t.componentLotCode : 'NOSUCH-1'
    if (name === 'index') return '0'
    return byBase[base] ?? randomUUID()
  })
}

/** Valid bodies of the routes that create things, for the mutated half of the runs. */
function validBodies(f: Fixtures): Record<string, Record<string, unknown>> {
  const step = f.draft.steps[0]!
  const serial = f.t.units[0]!.serial
  return {
    'post /api/products': { code: `F${uniqueSuffix().slice(0, 5)}`, name: 'Fuzz unit' },
    'post /api/revisions/:id/windings': { name: 'aux', nominalTurns: 40, alNanoHenry: 2500 },
    'post /api/revisions/:id/steps': { name: 'Inspect', stationKind: 'inspection' },
    'post /api/steps/:id/checks': {
      key: 'l_aux',
      label: 'Aux inductance',
      kind: 'numeric',
      unit: 'mH',
      lower: 1,
      upper: 5,
    },
    'post /api/parts': {
      partNumber: `FZ-${uniqueSuffix()}`,
      description: 'Fuzz core',
      unitOfMeasure: 'set',
    },
    'post /api/revisions/:id/bom': {
      partId: f.draft.bom[0]!.partId,
      quantity: 2,
      fittedAtStepId: step.id,
    },
    'post /api/lots': { revisionId: f.t.rev.id, quantity: 2, orderRef: 'PO-FUZZ' },
    'post /api/component-lots': {
      partId: f.t.rev.bom[0]!.partId,
      supplierName: 'Fuzz',
      supplierLotCode: 'S-FUZZ',
      quantityReceived: 5,
      receivedOn: '2026-11-01',
    },
    'post /api/customers': { name: 'Fuzz customer' },
    'post /api/step-runs': {
      clientEventId: randomUUID(),
      serial,
      stationCode: 'WND-1',
      values: { l_sec: 25.39 },
      consumptions: [{ bomLineId: f.t.rev.bom[0]!.id, code: f.t.componentLotCode }],
    },
    'post /api/service-cases': {
      serial,
      complaint: 'no output after a week',
      receivedOn: '2026-12-01',
    },
    'post /api/shipments': { customerId: f.customerId, shippedOn: '2026-12-01', serials: [serial] },
    'post /api/lots/:id/hold': { reason: 'fuzzing the hold' },
    'patch /api/products/:id': { name: 'Fuzz unit renamed' },
    'patch /api/revisions/:id': { notes: 'fuzz notes' },
    'patch /api/steps/:id': { name: 'Winding again', instructions: 'wind it' },
    'patch /api/checks/:id': { label: 'Inductance again', lower: 18 },
    'patch /api/windings/:id': { name: 'secondary', nominalTurns: 91 },
    'patch /api/bom-lines/:id': { quantity: 1 },
    'patch /api/parts/:id': { description: 'Fuzz core again' },
    'patch /api/component-lots/:id': { notes: 'fuzz notes' },
    'patch /api/lots/:id': { orderRef: 'PO-FUZZ-2', customerName: 'Fuzz' },
    'patch /api/customers/:id': { name: 'Fuzz customer again' },
    'put /api/revisions/:id/steps/order': { stepIds: f.draft.steps.map((s) => s.id).reverse() },
    'post /api/lots/:id/documents': { kind: 'lot_report' },
    'post /api/trace/component-lots/:code/contain': {
      reason: 'the supplier reported a bad batch of cores',
    },
  }
}

/** What ends a record's life goes last, so the routes before it still find it open. */
const isFinal = (r: RegisteredRoute) => /\/(close|obsolete|release|logout)$/.test(r.path)

describe('every write route against arbitrary bodies', () => {
  const clients = new Map<Role | 'anonymous', TestClient>()
  let f: Fixtures

  beforeAll(async () => {
    testApp()
    await resetSignInLimits()
    for (const role of ROLES) clients.set(role, await signedInAs(role))
    const anonymous = new TestClient()
    await anonymous.refreshCsrf()
    clients.set('anonymous', anonymous)
    const engineer = clients.get('engineer')!
    const lead = clients.get('lead')!
    const t = await releasedTestLot({ engineer, lead, stores: clients.get('stores')! }, 3)
    const draft = await buildSmallRecipe(engineer)
    const customer = await lead.post('/api/customers', { name: `Fuzz ${uniqueSuffix()}` })
    const found = await clients
      .get('stores')!
      .get(`/api/component-lots?q=${encodeURIComponent(t.componentLotCode)}`)
    f = {
      t,
      draft,
      customerId: customer.body.id,
      componentLotId: (found.body as { rows: { id: string }[] }).rows[0]!.id,
    }
  }, 120_000)

  // Failed sign-ins from the login route's runs must not lock out the next test file.
  afterAll(() => resetSignInLimits())

  it(
    'never answers 5xx; a refusal names a field and changes no row',
    { timeout: 600_000 },
    async () => {
      const writes = registeredRoutes.filter((r) => ['post', 'patch', 'put'].includes(r.method))
      const ordered = [...writes.filter((r) => !isFinal(r)), ...writes.filter(isFinal)]
      const ids = [
        f.t.lot.id,
        f.t.rev.id,
        f.draft.id,
        f.draft.steps[0]!.id,
        f.t.rev.bom[0]!.id,
        f.customerId,
        f.componentLotId,
        f.t.units[0]!.serial,
        f.t.componentLotCode,
        randomUUID(),
      ]
      const { junk, mutated } = arbitraries(schemaKeys(), ids)
      const seeds = validBodies(f)
      const failures: string[] = []
      const statuses = new Map<number, number>()
      let requests = 0
      const started = Date.now()

      for (const [index, rule] of ordered.entries()) {
        const key = `${rule.method} ${rule.path}`
        const client =
          rule.access === 'public'
            ? clients.get('anonymous')!
            : clients.get(rule.access === 'signed_in' ? 'admin' : rule.access[0]!)!
        const path = pathFor(rule, f)
        const seed = seeds[key]
        const body: fc.Arbitrary<Body> = seed
          ? fc.oneof({ weight: 1, arbitrary: junk }, { weight: 2, arbitrary: mutated(seed) })
          : junk
        const result = await fc.check(
          fc.asyncProperty(body, async (sent) => {
            const before = await tableSnapshot()
            // Serialised here: supertest sends a bare string form-encoded and refuses a number.
            const res = await client
              .send(rule.method as 'post', path)
              .set('Content-Type', 'application/json')
              .send(JSON.stringify(sent))
            requests++
            console.log(key, res.status, JSON.stringify(sent).slice(0, 120))
            statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1)
            const where = `${key} → ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`
            if (res.status >= 500) throw new Error(where)
            if (res.status < 400) return
            if (!/application\/json/.test(res.headers['content-type'] ?? ''))
              throw new Error(`${where}: not JSON`)
            const err = res.body as { error?: unknown; message?: unknown; fields?: unknown }
            if (typeof err.error !== 'string' || typeof err.message !== 'string')
              throw new Error(`${where}: no error and message`)
            if ([400, 413, 415].includes(res.status)) {
              const fields = Object.values((err.fields ?? {}) as Record<string, unknown>)
              if (!fields.length || !fields.every((m) => typeof m === 'string'))
                throw new Error(`${where}: names no field`)
            }
            const after = await tableSnapshot()
            const changed = Object.keys(after).filter((t) => after[t] !== before[t])
            if (changed.length) throw new Error(`${where}: refused, yet changed ${changed}`)
          }),
          { seed: SEED + index, numRuns: NUM_RUNS, endOnFailure: true },
        )
        if (result.failed)
          failures.push(
            `${result.errorInstance instanceof Error ? result.errorInstance.message : String(result.errorInstance)}\n  body: ${JSON.stringify(result.counterexample?.[0])?.slice(0, 300)}`,
          )
      }

      const seconds = ((Date.now() - started) / 1000).toFixed(1)
      console.info(
        `route fuzz: ${ordered.length} routes, ${requests} requests in ${seconds} s; statuses ${JSON.stringify(Object.fromEntries([...statuses].sort((a, b) => a[0] - b[0])))}`,
      )
      expect(failures).toEqual([])
      expect(ordered.length).toBeGreaterThan(50)
      expect(requests).toBeGreaterThanOrEqual(ordered.length * NUM_RUNS)
    },
  )
})
