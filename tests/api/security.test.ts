import { randomUUID } from 'node:crypto'
import { parse as parseCsv } from 'csv-parse/sync'
import { symbols } from 'pino'
import request from 'supertest'
import { Op } from 'sequelize'
import { beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { buildApp } from '../../server/main/app'
import { DEMO_PASSWORD } from '../../server/seed/demoUsers'
import { logger } from '../../server/logger'
import { servedType } from '../../server/middleware/storedFile'
import { PASSWORD_LIMITS } from '../../server/middleware/rateLimits'
import { AuditEvent, Upload } from '../../server/models'
import { redisConnection, redisPrefix } from '../../server/redis'
import { FILE_NAME_MAX } from '../../server/services/receiving/uploads'
import { loadTestRun, releasedLotOf, windingRun } from './support/floor'
import { buildSmallRecipe } from './support/recipes'
import {
  LOT_ROLES,
  TestClient,
  resetSignInLimits,
  signedInRoles,
  testApp,
  uniqueSuffix,
} from './support/client'
import { binary } from './support/pdf'

const LEAD = 'lead@ferncastle.example'
const ENGINEER = 'engineer@ferncastle.example'
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)
const FORMULA = '=HYPERLINK("http://evil.example/x","open")'

/** The session id inside a `waymark.sid=s%3A<id>.<signature>` cookie. */
function sessionIdOf(setCookie: string[] | string | undefined): { cookie: string; sid: string } {
  const all = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : []
  const cookie = all.find((c) => c.startsWith('waymark.sid='))!.split(';')[0]!
  const value = decodeURIComponent(cookie.slice('waymark.sid='.length))
  return { cookie, sid: value.slice(2, value.lastIndexOf('.')) }
}

describe('security', () => {
  const { engineer, lead, stores, operator, admin, service } = signedInRoles(
    ...LOT_ROLES,
    'admin',
    'service',
  )
  let defectId = ''

  beforeAll(async () => {
    testApp()
    defectId = (await operator.get('/api/defect-codes')).body.find(
      (d: { code: string }) => d.code === 'W-TURNS',
    ).id
  })
  beforeEach(resetSignInLimits)

  /** Releases `rev`, makes a released lot of it and a component lot of its first BOM part. */
  function lotOf(rev: RevisionDto, quantity: number, supplierLotCode?: string) {
    return releasedLotOf({ engineer, lead, stores }, rev, quantity, { supplierLotCode })
  }

  /** A lot whose load test needs a second person's signature. */
  async function signoffLot() {
    const rev = await buildSmallRecipe(engineer)
    const load = rev.steps.find((s) => s.name === 'Load test')!
    await engineer.patch(`/api/steps/${load.id}`, { requiresSignoff: true }).expect(200)
    return lotOf(rev, 1)
  }

  /** The rate-limit counters of this test lane, by kind (`ip`, `account`) and key. */
  async function counters(kind: 'ip' | 'account'): Promise<Map<string, number>> {
    const redis = redisConnection()
    const prefix = `${redisPrefix}:rl:${kind}:`
    const keys = await redis.keys(`${prefix}*`)
    const out = new Map<string, number>()
    for (const k of keys) out.set(k.slice(prefix.length), Number(await redis.get(k)))
    return out
  }

  describe('password checks share one limiter', () => {
    it(
      'slows guessing at a step’s second signature per account and per address, with sign-in',
      { timeout: 120_000 },
      async () => {
        const t = await signoffLot()
        const serial = t.units[0]!.serial
        await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
        const since = new Date(Date.now() - 1000)
        const scan = (password: string) =>
          operator.post(
            '/api/step-runs',
            loadTestRun(serial, 350, { countersign: { email: LEAD, password } }),
          )
        for (let i = 0; i < PASSWORD_LIMITS.perAccount; i++) {
          const miss = await scan(`guess-${i}`)
          expect(miss.status).toBe(400)
          expect(miss.body).toMatchObject({ error: 'countersign_rejected' })
          expect(miss.body.fields).toHaveProperty('countersign')
        }
        // Over the limit even the right password waits, and so does the account's own sign-in.
        const blocked = await scan(DEMO_PASSWORD)
        expect(blocked.status).toBe(429)
        expect(blocked.body.error).toBe('too_many_attempts')
        expect((await new TestClient().signIn(LEAD)).status).toBe(429)
        // Both counters saw every miss: the account's and this client's address.
        expect((await counters('account')).get(LEAD)).toBeGreaterThanOrEqual(
          PASSWORD_LIMITS.perAccount,
        )
        const byIp = [...(await counters('ip')).values()]
        expect(byIp).toHaveLength(1)
        expect(byIp[0]).toBeGreaterThanOrEqual(PASSWORD_LIMITS.perAccount)
        // Each miss is audited under the operator at the bench, naming the account tried.
        const misses = await AuditEvent.findAll({
          where: {
            action: 'countersign.failed',
            at: { [Op.gte]: since },
            actorEmail: 'operator@ferncastle.example',
          },
        })
        const mine = misses.filter((e) => (e.after as { triedEmail?: string }).triedEmail === LEAD)
        expect(mine).toHaveLength(PASSWORD_LIMITS.perAccount)
        for (const e of mine) {
          expect(e.ip).toMatch(/127\.0\.0\.1|::1/)
          expect(e.after).toMatchObject({ what: 'Load test', reason: 'wrong_password' })
          expect(JSON.stringify(e.toJSON())).not.toContain('guess-')
        }
        // The unit did not move; once the window is over the right signature is taken.
        await resetSignInLimits()
        const signed = await scan(DEMO_PASSWORD)
        expect(signed.status).toBe(201)
        expect(signed.body.unit.state).toBe('passed')
      },
    )

    it('does not count a scan without a countersign, or one refused for another reason', async () => {
      const t = await signoffLot()
      const serial = t.units[0]!.serial
      await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
      // Right password, but the operator cannot sign their own step: refused, not counted.
      const self = await operator.post(
        '/api/step-runs',
        loadTestRun(serial, 350, {
          countersign: { email: 'operator@ferncastle.example', password: DEMO_PASSWORD },
        }),
      )
      expect(self.status).toBe(400)
      expect(self.body.error).toBe('validation_failed')
      // The decrement follows the answer: wait for it with a deadline.
      const deadline = Date.now() + 10_000
      while (
        (await counters('account')).get('operator@ferncastle.example') &&
        Date.now() < deadline
      )
        await new Promise((r) => setTimeout(r, 50))
      expect((await counters('account')).get('operator@ferncastle.example') ?? 0).toBe(0)
      // A scan without a countersign never reaches the counters.
      await resetSignInLimits()
      await operator.post('/api/step-runs', loadTestRun(serial, 350)).expect(400)
      expect((await counters('ip')).size).toBe(0)
      expect((await counters('account')).size).toBe(0)
    })

    it(
      'slows guessing at the use-as-is countersign the same way',
      { timeout: 120_000 },
      async () => {
        const rev = await buildSmallRecipe(engineer)
        const t = await lotOf(rev, 1)
        const serial = t.units[0]!.serial
        await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
        const nc = (
          await operator.post(
            '/api/step-runs',
            loadTestRun(serial, 356, { defectCodeId: defectId }),
          )
        ).body.nonconformanceId as string
        const since = new Date(Date.now() - 1000)
        const dispose = (password: string) =>
          lead.post(`/api/nonconformances/${nc}/disposition`, {
            disposition: 'use_as_is',
            reason: 'output 1 V over; customer accepts per deviation note',
            countersign: { email: ENGINEER, password },
          })
        for (let i = 0; i < PASSWORD_LIMITS.perAccount; i++)
          expect((await dispose(`guess-${i}`)).body.error).toBe('countersign_rejected')
        const blocked = await dispose(DEMO_PASSWORD)
        expect(blocked.status).toBe(429)
        const misses = await AuditEvent.findAll({
          where: { action: 'countersign.failed', at: { [Op.gte]: since }, actorEmail: LEAD },
        })
        expect(
          misses.filter((e) => (e.after as { triedEmail?: string }).triedEmail === ENGINEER),
        ).toHaveLength(PASSWORD_LIMITS.perAccount)
        await resetSignInLimits()
        expect((await dispose(DEMO_PASSWORD)).body).toMatchObject({ disposition: 'use_as_is' })
      },
    )
  })

  describe('client address', () => {
    /** A browser-like client of `app` that fails sign-ins claiming `forwardedFor`. */
    async function failer(app: ReturnType<typeof buildApp>) {
      const agent = request.agent(app)
      const csrf = (await agent.get('/api/auth/csrf').expect(200)).body.csrfToken as string
      return (email: string, forwardedFor: string) =>
        agent
          .post('/api/auth/login')
          .set('X-CSRF-Token', csrf)
          .set('X-Forwarded-For', forwardedFor)
          .send({ email, password: 'not-it' })
    }

    it(
      'ignores X-Forwarded-For by default: the limit holds and the audit has the socket',
      { timeout: 120_000 },
      async () => {
        const fail = await failer(testApp())
        const tag = uniqueSuffix().toLowerCase()
        for (let i = 0; i < PASSWORD_LIMITS.perIp; i++)
          expect(
            (await fail(`nobody-${i}-${tag}@ferncastle.example`, `198.51.100.${i + 1}`)).status,
          ).toBe(401)
        const next = await fail(`nobody-x-${tag}@ferncastle.example`, '203.0.113.77')
        expect(next.status).toBe(429)
        const row = await AuditEvent.findOne({
          where: {
            action: 'auth.sign_in_failed',
            actorEmail: `nobody-0-${tag}@ferncastle.example`,
          },
        })
        expect(row!.ip).toMatch(/127\.0\.0\.1|::1/)
        expect(row!.ip).not.toContain('198.51.100')
      },
    )

    it(
      'honours X-Forwarded-For from the proxy named in TRUST_PROXY',
      { timeout: 120_000 },
      async () => {
        const fail = await failer(buildApp({ trustProxy: 'loopback' }))
        const tag = uniqueSuffix().toLowerCase()
        for (let i = 0; i < PASSWORD_LIMITS.perIp; i++)
          expect((await fail(`nobody-${i}-${tag}@ferncastle.example`, '198.51.100.7')).status).toBe(
            401,
          )
        expect((await fail(`nobody-y-${tag}@ferncastle.example`, '198.51.100.7')).status).toBe(429)
        // Another client behind the same proxy has a count of its own.
        expect((await fail(`nobody-z-${tag}@ferncastle.example`, '203.0.113.77')).status).toBe(401)
        const row = await AuditEvent.findOne({
          where: {
            action: 'auth.sign_in_failed',
            actorEmail: `nobody-z-${tag}@ferncastle.example`,
          },
        })
        expect(row!.ip).toBe('203.0.113.77')
      },
    )
  })

  describe('draft revisions', () => {
    it('are hidden, with their BOM, from roles that do not read drafts', async () => {
      const rev = await buildSmallRecipe(engineer)
      for (const c of [operator, stores, service]) {
        expect((await c.get(`/api/revisions/${rev.id}`)).status).toBe(404)
        expect((await c.get(`/api/revisions/${rev.id}/bom`)).status).toBe(404)
        const product = (await c.get('/api/products').expect(200)).body.find(
          (p: { id: string }) => p.id === rev.productId,
        )
        expect(product.revisions).toEqual([])
      }
      for (const c of [engineer, lead, admin]) {
        expect((await c.get(`/api/revisions/${rev.id}/bom`).expect(200)).body).toHaveLength(1)
        const product = (await c.get('/api/products').expect(200)).body.find(
          (p: { id: string }) => p.id === rev.productId,
        )
        expect(product.revisions).toEqual([{ id: rev.id, letter: 'A', status: 'draft' }])
      }
      // An id that is no revision answers the same 404.
      expect((await engineer.get(`/api/revisions/${randomUUID()}/bom`)).status).toBe(404)
      // Released (and later obsolete) revisions stay readable by everyone signed in.
      await engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
      expect((await operator.get(`/api/revisions/${rev.id}/bom`).expect(200)).body).toHaveLength(1)
      await engineer.post(`/api/revisions/${rev.id}/obsolete`).expect(200)
      expect((await operator.get(`/api/revisions/${rev.id}/bom`).expect(200)).body).toHaveLength(1)
      const product = (await operator.get('/api/products').expect(200)).body.find(
        (p: { id: string }) => p.id === rev.productId,
      )
      expect(product.revisions).toEqual([{ id: rev.id, letter: 'A', status: 'obsolete' }])
    })
  })

  describe('CSV files', () => {
    // Formula guard: OWASP "CSV Injection" (a leading apostrophe on text starting =, +, -, @,
    // tab or CR); numbers untouched.
    let t: Awaited<ReturnType<typeof lotOf>>
    beforeAll(async () => {
      const rev = await buildSmallRecipe(engineer)
      await engineer.patch(`/api/products/${rev.productId}`, { name: FORMULA }).expect(200)
      await engineer.patch(`/api/steps/${rev.steps[0]!.id}`, { name: '@SUM(1+1)' }).expect(200)
      t = await lotOf(rev, 1, '+cmd|calc')
      // 24.3 mH on AL 3000 nH is 90 turns, N = sqrt(L / AL) (common practice, no source):
      // 2 under the 92 planned, so the deviation cell is the number -2.
      await operator
        .post('/api/step-runs', windingRun(t, t.units[0]!.serial, { values: { l_sec: 24.3 } }))
        .expect(201)
    })

    const rowsOf = (text: string) =>
      parseCsv(text, { bom: true, columns: true }) as Record<string, string>[]

    it('guards text in the measurements export and leaves negative numbers alone', async () => {
      const res = await engineer
        .get(`/api/exports/lots/${t.lot.id}/measurements?format=csv`)
        .expect(200)
      const [row] = rowsOf(res.text)
      expect(row!.Step).toBe("'@SUM(1+1)")
      expect(row!['Deviation (turns)']).toMatch(/^-\d/)
      expect(Number(row!['Deviation (turns)'])).toBeCloseTo(-2, 6)
      expect(row!.Serial).toBe(t.units[0]!.serial)
    })

    it('writes the lots table through the same guarded writer', async () => {
      // Its text cells are a lot number, a product code ([A-Z0-9]{2,6}) and a revision letter,
      // none of which can start a formula; numbers must stay numbers.
      const today = new Date().toISOString().slice(0, 10)
      const res = await lead
        .get(`/api/exports/lots?format=csv&from=${today}&to=${today}&productId=${t.rev.productId}`)
        .expect(200)
      const [row] = rowsOf(res.text)
      expect(row!.Product).toMatch(/^[A-Z0-9]{2,6}$/)
      expect(row!['Units started (units)']).toBe('1')
      expect(res.text).not.toContain("'")
    })

    it('guards text in the recall scope CSV', async () => {
      const res = await service
        .get(`/api/trace/component-lots/${t.componentLotCode}?format=csv`)
        .expect(200)
      const [row] = parseCsv(res.text, { columns: true }) as Record<string, string>[]
      expect(row!.supplier_lot).toBe("'+cmd|calc")
      expect(row!.quantity_fitted).toBe('1')
    })
  })

  describe('stored files', () => {
    it('keeps a safe base name of what was uploaded', async () => {
      const lot = (
        await stores
          .post('/api/component-lots', {
            partId: (await buildSmallRecipe(engineer)).bom[0]!.partId,
            supplierName: 'Test',
            supplierLotCode: `S-${uniqueSuffix()}`,
            quantityReceived: 5,
            receivedOn: '2026-11-01',
          })
          .expect(201)
      ).body as { id: string }
      const put = (name: string) =>
        stores.send('put', `/api/component-lots/${lot.id}/certificate`).attach('file', PDF, name)
      const sneaky = await put('..\\..\\etc/ ..gdp.exe.pdf')
      expect(sneaky.status).toBe(200)
      expect(sneaky.body.certificate.filename).toBe('gdp.exe.pdf')
      // A control character in the part header: busboy cannot read it, a 400 and not a 500.
      const broken = await put('bell\u0007.pdf')
      expect(broken.status).toBe(400)
      expect(broken.body.fields).toHaveProperty('file')
      const long = await put(`${'x'.repeat(300)}.pdf`)
      expect(long.body.certificate.filename).toHaveLength(FILE_NAME_MAX)
      expect(long.body.certificate.filename).toMatch(/^x+\.pdf$/)
    })

    it('serves a certificate as a sandboxed download of its checked type', async () => {
      const rev = await buildSmallRecipe(engineer)
      const lot = (
        await stores
          .post('/api/component-lots', {
            partId: rev.bom[0]!.partId,
            supplierName: 'Test',
            supplierLotCode: `S-${uniqueSuffix()}`,
            quantityReceived: 5,
            receivedOn: '2026-11-01',
          })
          .expect(201)
      ).body as { id: string }
      const up = await stores
        .send('put', `/api/component-lots/${lot.id}/certificate`)
        .attach('file', PDF, 'mill "cert".pdf')
      const get = () => binary(service.get(`/api/component-lots/${lot.id}/certificate`))
      const res = await get()
      expect(res.status).toBe(200)
      expect(res.headers['content-disposition']).toMatch(
        /^attachment; filename="mill \\"cert\\".pdf"/,
      )
      expect(res.headers['content-type']).toBe('application/pdf')
      expect(res.headers['x-content-type-options']).toBe('nosniff')
      expect(res.headers['content-security-policy']).toBe("sandbox; default-src 'none'")
      expect(Buffer.compare(res.body as Buffer, PDF)).toBe(0)
      // A recorded type the bytes do not bear out is served as opaque bytes.
      await Upload.update({ contentType: 'text/html' }, { where: { id: up.body.certificate.id } })
      expect((await get()).headers['content-type']).toBe('application/octet-stream')
    })

    it('types unknown content as opaque bytes', async () => {
      expect(await servedType(Buffer.from('<script>alert(1)</script>'), 'text/html')).toBe(
        'application/octet-stream',
      )
      expect(await servedType(PDF, 'image/png')).toBe('application/octet-stream')
      expect(await servedType(PDF, 'application/pdf')).toBe('application/pdf')
    })
  })

  describe('sessions', () => {
    it('refuses a state change with a missing or wrong CSRF token, changing nothing', async () => {
      const code = `X${uniqueSuffix().slice(0, 4)}`
      const body = { code, name: 'Forged', kind: 'winding' }
      const none = await admin.agent.post('/api/stations').send(body)
      const wrong = await admin.agent
        .post('/api/stations')
        .set('X-CSRF-Token', `${admin.csrf.slice(0, -4)}AAAA`)
        .send(body)
      for (const res of [none, wrong]) {
        expect(res.status).toBe(403)
        expect(res.body.error).toBe('csrf_invalid')
      }
      const stations = (await admin.get('/api/stations').expect(200)).body as { code: string }[]
      expect(stations.map((s) => s.code)).not.toContain(code)
    })

    it('ends the old session cookie at sign-out, even when sent again', async () => {
      const c = new TestClient()
      const res = await c.signIn('service@ferncastle.example')
      const { cookie } = sessionIdOf(res.headers['set-cookie'])
      await c.post('/api/auth/logout').expect(204)
      await request(testApp()).get('/api/auth/me').set('Cookie', cookie).expect(401)
    })

    it('ends every session of a user whose password an admin changes', async () => {
      const email = `mover-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
      const created = await admin
        .post('/api/users', { email, name: 'Pass Changer', role: 'lead', password: 'first-pass-1' })
        .expect(201)
      const [a, b] = [new TestClient(), new TestClient()]
      await a.signIn(email, 'first-pass-1')
      await b.signIn(email, 'first-pass-1')
      await a.get('/api/stations').expect(200)
      await admin.patch(`/api/users/${created.body.id}`, { password: 'second-pass-2' }).expect(200)
      await a.get('/api/stations').expect(401)
      await b.get('/api/stations').expect(401)
      expect((await new TestClient().signIn(email, 'first-pass-1')).status).toBe(401)
      expect((await new TestClient().signIn(email, 'second-pass-2')).status).toBe(200)
    })

    it(
      'never writes a password or session id to the log or into an answer',
      { timeout: 120_000 },
      async () => {
        const secret = `Sesame-${uniqueSuffix()}-${uniqueSuffix()}`
        const wrong = `Wrong-${uniqueSuffix()}-${uniqueSuffix()}`
        const email = `signer-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
        await admin
          .post('/api/users', { email, name: 'Second Signer', role: 'lead', password: secret })
          .expect(201)
        const t = await signoffLot()
        const serial = t.units[0]!.serial
        await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)

        // Capture every log line at every level while the flows run.
        const stream = (logger as unknown as Record<symbol, { write: (s: string) => boolean }>)[
          symbols.streamSym
        ]!
        const write = stream.write
        const level = logger.level
        const lines: string[] = []
        const answers: string[] = []
        stream.write = (s: string) => {
          lines.push(s)
          return true
        }
        logger.level = 'trace'
        try {
          const c = new TestClient()
          answers.push(JSON.stringify((await c.signIn(email, wrong)).body))
          const ok = await c.signIn(email, secret)
          answers.push(JSON.stringify(ok.body))
          const { cookie, sid } = sessionIdOf(ok.headers['set-cookie'])
          answers.push(JSON.stringify((await c.get('/api/auth/me')).body))
          const sign = (password: string) =>
            operator.post(
              '/api/step-runs',
              loadTestRun(serial, 350, { countersign: { email, password } }),
            )
          answers.push(JSON.stringify((await sign(wrong)).body))
          const signed = await sign(secret)
          expect(signed.status).toBe(201)
          answers.push(JSON.stringify(signed.body))
          answers.push(JSON.stringify((await admin.get('/api/audit-events?entity=user')).body))
          answers.push(JSON.stringify((await admin.get('/api/users')).body))
          await c.post('/api/auth/logout').expect(204)
          expect(lines.length).toBeGreaterThan(0) // the capture works
          const logged = lines.join('')
          const answered = answers.join('\n')
          for (const text of [secret, wrong, sid, cookie, encodeURIComponent(sid)]) {
            expect(logged).not.toContain(text)
            expect(answered).not.toContain(text)
          }
        } finally {
          stream.write = write
          logger.level = level
        }
      },
    )
  })
})
