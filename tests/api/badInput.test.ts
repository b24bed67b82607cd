import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Response } from 'supertest'
import { unitUrl } from '../../shared/links'
import { ROLES } from '../../shared/roles'
import type { Role } from '../../shared/roles'
import type { RegisteredRoute } from '../../server/routes/registry'
import { registeredRoutes } from '../../server/routes/registry'
import { resetSignInLimits, signedInAs, TestClient, testApp, uniqueSuffix } from './support/client'
import { releasedTestLot } from './support/floor'
import type { TestLot } from './support/floor'
import { tableSnapshot } from './support/rows'

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete'

const clients = new Map<Role | 'anonymous', TestClient>()

/** The client of a role that may call the route (the first role its rule lists). */
function clientFor(rule: RegisteredRoute): TestClient {
  const { access } = rule
  if (access === 'public') return clients.get('anonymous')!
  return clients.get(access === 'signed_in' ? 'admin' : access[0]!)!
}

function call(client: TestClient, method: Method, path: string, body: object = {}) {
  return method === 'get' ? client.get(path) : client.send(method, path, body)
}

/** A refusal as the API promises one: the status, a JSON error body, and the field it names. */
function expectRefusal(res: Response, status: number, field: string, what = '') {
  const where = `${what} → ${res.status} ${JSON.stringify(res.body)}`
  expect(res.status, where).toBe(status)
  expect(res.headers['content-type'], where).toMatch(/application\/json/)
  expect(typeof res.body.error, where).toBe('string')
  expect(typeof res.body.message, where).toBe('string')
  expect(res.body.fields?.[field], where).toEqual(expect.any(String))
}

/** A valid-looking value for a path parameter, by its name. */
function fillerFor(name: string): string {
  if (name === 'serial') return 'FP24-2649-00017K'
  if (name === 'code') return 'WND-1'
  if (name === 'index') return '0'
  return randomUUID()
}

const PDF = Buffer.from('%PDF-1.4\n1 0 obj << >> endobj\ntrailer << >>\n%%EOF\n')

describe('bad input is a 4xx that names the field, and writes nothing', () => {
  let t: TestLot
  let serial: string
  let customerId: string
  let componentLotId: string
  let before: Record<string, string>

  beforeAll(async () => {
    testApp()
    await resetSignInLimits()
    for (const role of ROLES) clients.set(role, await signedInAs(role))
    const anonymous = new TestClient()
    await anonymous.refreshCsrf()
    clients.set('anonymous', anonymous)
    t = await releasedTestLot(
      {
        engineer: clients.get('engineer')!,
        lead: clients.get('lead')!,
        stores: clients.get('stores')!,
      },
      2,
    )
    serial = t.units[0]!.serial
    const made = await clients
      .get('lead')!
      .post('/api/customers', { name: `Bad ${uniqueSuffix()}` })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    customerId = made.body.id
    const lots = await clients
      .get('stores')!
      .get(`/api/component-lots?q=${encodeURIComponent(t.componentLotCode)}`)
      .expect(200)
    componentLotId = (lots.body as { rows: { id: string }[] }).rows[0]!.id
    before = await tableSnapshot()
  }, 120_000)

  // Every case below is refused, so not one row may have changed from first to last.
  afterAll(async () => {
    expect(await tableSnapshot()).toEqual(before)
  })

  it('answers broken percent-encoding in any path parameter with a 400 naming it', async () => {
    const withParams = registeredRoutes.filter((r) => r.path.includes('/:'))
    expect(withParams.length).toBeGreaterThan(60)
    const failures: string[] = []
    let sent = 0
    for (const rule of withParams) {
      const names = [...rule.path.matchAll(/:(\w+)/g)].map((m) => m[1]!)
      for (const name of names)
        for (const broken of ['%E0%A4%A', '%ED%A0%80']) {
          const path = rule.path.replace(/:(\w+)/g, (_m, n: string) =>
            n === name ? broken : fillerFor(n),
          )
          const res = await call(clientFor(rule), rule.method, path)
          sent++
          const named = (res.body as { fields?: Record<string, string> }).fields?.[name]
          if (res.status !== 400 || typeof named !== 'string')
            failures.push(`${rule.method} ${path}: ${res.status} ${JSON.stringify(res.body)}`)
        }
    }
    expect(failures).toEqual([])
    expect(sent).toBeGreaterThan(120)
  }, 180_000)

  it('answers a NUL in a path parameter with a 400 naming it', async () => {
    const operator = clients.get('operator')!
    expectRefusal(await operator.get('/api/floor/units/%00?station=WND-1'), 400, 'serial')
    expectRefusal(await operator.get('/api/floor/stations/WND%00/recent'), 400, 'code')
    const admin = clients.get('admin')!
    expectRefusal(await admin.get(`/api/outbox/${randomUUID()}/attachments/%00`), 400, 'index')
  })

  it('reads a % in a scanned serial or lot code as "not a serial", in paths and bodies', async () => {
    const operator = clients.get('operator')!
    const lead = clients.get('lead')!
    // Paths: Express decodes the parameter once; the scan is not decoded a second time.
    for (const text of ['ZZ%', '50%OFF']) {
      const p = encodeURIComponent(text)
      expectRefusal(await operator.get(`/api/floor/units/${p}?station=WND-1`), 400, 'serial', text)
      expectRefusal(
        await operator.get(`/api/floor/component-lots/${p}?bomLineId=${t.rev.bom[0]!.id}`),
        400,
        'code',
        text,
      )
      expectRefusal(await lead.get(`/api/trace/units/${p}`), 400, 'serial', text)
      expectRefusal(await lead.get(`/api/trace/component-lots/${p}`), 400, 'code', text)
      expectRefusal(await lead.get(`/api/shipments/units/${p}`), 400, 'serial', text)
      expectRefusal(await lead.post(`/api/units/${p}/certificate`, {}), 400, 'serial', text)
      expectRefusal(
        await lead.post(`/api/trace/component-lots/${p}/contain`, {
          reason: 'the supplier reported a bad batch of cores',
        }),
        400,
        'code',
        text,
      )
    }
    // A traveler URL holding a broken or a %-bearing serial is not a serial either.
    for (const url of ['http://127.0.0.1/u/ZZ%', 'http://127.0.0.1/u/%E0%A4%A']) {
      const p = encodeURIComponent(url)
      expectRefusal(await operator.get(`/api/floor/units/${p}?station=WND-1`), 400, 'serial', url)
    }
    // …while a real traveler URL, percent-encoded into the path, still finds its unit.
    const good = encodeURIComponent(unitUrl('http://127.0.0.1:4870', serial))
    const found = await operator.get(`/api/floor/units/${good}?station=WND-1`)
    expect(found.status, JSON.stringify(found.body)).toBe(200)
    expect(found.body.unit.serial).toBe(serial)

    // Bodies.
    const run = (over: object) => ({
      clientEventId: randomUUID(),
      serial,
      stationCode: 'WND-1',
      values: { l_sec: 25.39 },
      consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: t.componentLotCode }],
      ...over,
    })
    expectRefusal(await operator.post('/api/step-runs', run({ serial: 'ZZ%' })), 400, 'serial')
    expectRefusal(
      await operator.post('/api/step-runs', run({ serial: 'http://h/u/50%OFF' })),
      400,
      'serial',
    )
    expectRefusal(
      await operator.post(
        '/api/step-runs',
        run({ consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: '50%OFF' }] }),
      ),
      400,
      'consumptions.0.code',
    )
    expectRefusal(
      await lead.post('/api/shipments', {
        customerId: randomUUID(),
        shippedOn: '2026-12-01',
        serials: [serial, 'ZZ%'],
      }),
      400,
      'serials.1',
    )
    expectRefusal(
      await lead.post('/api/service-cases', {
        serial: '50%OFF',
        complaint: 'no output after a week',
        receivedOn: '2026-12-01',
      }),
      400,
      'serial',
    )
  })

  it('refuses a NUL or a lone surrogate in text fields at validation', async () => {
    const operator = clients.get('operator')!
    const admin = clients.get('admin')!
    const lead = clients.get('lead')!
    const stores = clients.get('stores')!
    for (const bad of ['A\u0000B', 'A\uD800B', 'A\uDC00']) {
      const what = JSON.stringify(bad)
      const run = (over: object) => ({
        clientEventId: randomUUID(),
        serial,
        stationCode: 'WND-1',
        values: { l_sec: 25.39 },
        consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: t.componentLotCode }],
        ...over,
      })
      expectRefusal(
        await operator.post('/api/step-runs', run({ serial: bad })),
        400,
        'serial',
        what,
      )
      expectRefusal(
        await operator.post('/api/step-runs', run({ stationCode: bad })),
        400,
        'stationCode',
        what,
      )
      expectRefusal(await operator.post('/api/step-runs', run({ note: bad })), 400, 'note', what)
      expectRefusal(
        await admin.post('/api/stations', { code: bad, name: 'Bench', kind: 'other' }),
        400,
        'code',
        what,
      )
      expectRefusal(
        await admin.post('/api/stations', { code: `B${uniqueSuffix()}`, name: bad, kind: 'other' }),
        400,
        'name',
        what,
      )
      expectRefusal(await lead.post('/api/customers', { name: `Cust ${bad}` }), 400, 'name', what)
      expectRefusal(
        await lead.patch(`/api/customers/${customerId}`, { name: `Cust ${bad}` }),
        400,
        'name',
        what,
      )
      expectRefusal(
        await stores.post('/api/component-lots', {
          partId: t.rev.bom[0]!.partId,
          supplierName: 'Test',
          supplierLotCode: `S-${uniqueSuffix()}`,
          quantityReceived: 5,
          receivedOn: '2026-11-01',
          notes: bad,
        }),
        400,
        'notes',
        what,
      )
    }
  })

  describe('malformed multipart on the upload routes', () => {
    const uploads = () => [
      {
        client: clients.get('stores')!,
        method: 'put' as const,
        path: `/api/component-lots/${componentLotId}/certificate`,
        field: 'file',
      },
      {
        client: clients.get('lead')!,
        method: 'post' as const,
        path: '/api/imports',
        field: 'file',
      },
    ]

    it('covers every route that takes a file', () => {
      const multipart = registeredRoutes.filter(
        (r) => r.path.endsWith('/certificate') && r.method === 'put',
      )
      expect(multipart.map((r) => r.path)).toEqual(['/api/component-lots/:id/certificate'])
      expect(registeredRoutes.some((r) => r.method === 'post' && r.path === '/api/imports')).toBe(
        true,
      )
    })

    it('answers a form without a boundary with a 400 naming the file', async () => {
      for (const u of uploads()) {
        const res = await u.client
          .send(u.method, u.path)
          .set('Content-Type', 'multipart/form-data')
          .send('--x\r\nContent-Disposition: form-data; name="file"\r\n\r\nabc\r\n--x--\r\n')
        expectRefusal(res, 400, u.field, u.path)
      }
    })

    it('answers a body cut off in the middle of the file with a 400 naming the file', async () => {
      for (const u of uploads()) {
        const body =
          '--cut\r\nContent-Disposition: form-data; name="stationCode"\r\n\r\nWND-1\r\n' +
          '--cut\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\n' +
          `Content-Type: application/pdf\r\n\r\n${PDF.toString('latin1').slice(0, 20)}`
        const res = await u.client
          .send(u.method, u.path)
          .set('Content-Type', 'multipart/form-data; boundary=cut')
          .send(body)
        expectRefusal(res, 400, u.field, u.path)
      }
    })

    it('answers a NUL in the file name with a 400 naming the file', async () => {
      for (const u of uploads())
        for (const disposition of [
          `form-data; name="file"; filename*=UTF-8''cert%00.pdf`,
          'form-data; name="file"; filename="cert\u0000.pdf"',
        ]) {
          const body =
            '--nul\r\nContent-Disposition: form-data; name="stationCode"\r\n\r\nWND-1\r\n' +
            `--nul\r\nContent-Disposition: ${disposition}\r\n` +
            `Content-Type: application/pdf\r\n\r\n${PDF.toString('latin1')}\r\n--nul--\r\n`
          const res = await u.client
            .send(u.method, u.path)
            .set('Content-Type', 'multipart/form-data; boundary=nul')
            .send(Buffer.from(body, 'latin1'))
          expectRefusal(res, 400, u.field, `${u.path} ${disposition}`)
        }
    })
  })

  it('answers a JSON body over 1 MB with 413 naming the body', async () => {
    const lead = clients.get('lead')!
    const res = await lead.post('/api/customers', { name: 'x'.repeat(1_100_000) })
    expectRefusal(res, 413, 'body')
  })

  it('answers another charset or content type on a JSON route with 415', async () => {
    const lead = clients.get('lead')!
    const json = JSON.stringify({ name: `Latin ${uniqueSuffix()}` })
    const cases: [string, string | Buffer][] = [
      ['application/json; charset=latin1', Buffer.from(json, 'latin1')],
      ['application/json; charset=iso-8859-1', Buffer.from(json, 'latin1')],
      ['text/plain', json],
      ['application/x-www-form-urlencoded', 'name=Form+customer'],
      [
        'multipart/form-data; boundary=b',
        '--b\r\nContent-Disposition: form-data; name="name"\r\n\r\nX\r\n--b--\r\n',
      ],
    ]
    for (const [type, body] of cases) {
      const res = await lead.post('/api/customers').set('Content-Type', type).send(body)
      expectRefusal(res, 415, 'body', type)
    }
    // A body-less action route refuses a body it would otherwise never read.
    const res = await lead
      .post(`/api/lots/${t.lot.id}/close`)
      .set('Content-Type', 'text/plain')
      .send('close it')
    expectRefusal(res, 415, 'body', 'text/plain on close')
    // An upload route refuses JSON: it takes multipart only.
    const stores = clients.get('stores')!
    const upload = await stores.send('put', `/api/component-lots/${randomUUID()}/certificate`, {
      file: 'x',
    })
    expectRefusal(upload, 415, 'body', 'JSON on an upload route')
  })
})
