import { createHash, randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DocumentDto } from '../../shared/schemas/lots'
import { DEMO_PASSWORD } from '../../server/seed/demoUsers'
import { startSmtpFake } from '../../server/devMail/smtpFake'
import { db, Document, Email } from '../../server/models'
import { getFile } from '../../server/storage'
import { signedInAs } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import {
  startApi,
  startAppProcess,
  stopAppProcesses,
  waitForOutput,
} from '../../scripts/lib/appProcess'
import type { AppProcess } from '../../scripts/lib/appProcess'

// Two API processes and two worker processes on this lane's PostgreSQL, Redis and bucket (the
// environment vitest was started with), as several machines behind a proxy would run.

const START_MS = 90_000
let fake: Awaited<ReturnType<typeof startSmtpFake>>
const children: AppProcess[] = []
let apiA = ''
let apiB = ''

/** A browser's session (cookie and CSRF token), usable against either API process. */
class Session {
  cookie = ''
  csrf = ''

  async call(base: string, method: string, path: string, body?: unknown) {
    const res = await fetch(`${base}${path}`, {
      method,
      headers: {
        'content-type': 'application/json',
        ...(this.cookie ? { cookie: this.cookie } : {}),
        ...(method === 'GET' ? {} : { 'x-csrf-token': this.csrf }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    })
    const set = res.headers.get('set-cookie')
    if (set) this.cookie = set.split(';')[0]!
    const text = await res.text()
    return { status: res.status, body: text ? (JSON.parse(text) as any) : null } // eslint-disable-line @typescript-eslint/no-explicit-any -- JSON of many shapes
  }

  async refreshCsrf(base: string) {
    this.csrf = (await this.call(base, 'GET', '/api/auth/csrf')).body.csrfToken as string
  }

  /** Signs in on `base`, as the client does: a token, the sign-in, then a fresh token. */
  async signIn(base: string, email: string) {
    await this.refreshCsrf(base)
    const res = await this.call(base, 'POST', '/api/auth/login', { email, password: DEMO_PASSWORD })
    if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`)
    await this.refreshCsrf(base)
  }
}

async function until<T>(what: string, probe: () => Promise<T | null>, ms = 120_000): Promise<T> {
  const deadline = Date.now() + ms
  for (;;) {
    const value = await probe()
    if (value !== null) return value
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`)
    await new Promise((r) => setTimeout(r, 150))
  }
}

beforeAll(async () => {
  fake = await startSmtpFake({ port: 0 })
  const common = { LOG_LEVEL: 'info', WAYMARK_SMTP_PORT: String(fake.port) }
  try {
    // Started one after another: two cores compile four tsx processes slowly enough as it is.
    const a = await startApi('api-a', { ...common, WAYMARK_WORKERS: 'off' }, START_MS)
    children.push(a.process)
    apiA = a.base
    const b = await startApi('api-b', { ...common, WAYMARK_WORKERS: 'off' }, START_MS)
    children.push(b.process)
    apiB = b.base
    for (const name of ['worker-1', 'worker-2']) {
      const w = startAppProcess(name, 'server/workers/index.ts', common)
      children.push(w)
      await waitForOutput(w, /workers started/, START_MS)
    }
  } catch (err) {
    await stopAppProcesses(children)
    throw err
  }
}, 4 * START_MS)

afterAll(async () => {
  await stopAppProcesses(children)
  await fake?.close()
}, 30_000)

describe('two API processes and two workers on one database, Redis and object store', () => {
  let t: TestLot
  const lead = new Session()
  const operator = new Session()

  beforeAll(async () => {
    // The recipe and the lot are set up in this process; the floor work below goes to the two.
    const clients = {
      engineer: await signedInAs('engineer'),
      lead: await signedInAs('lead'),
      stores: await signedInAs('stores'),
    }
    t = await releasedTestLot(clients, 6)
    // Each signs in on one process and works through both.
    await lead.signIn(apiA, 'lead@ferncastle.example')
    await operator.signIn(apiB, 'operator@ferncastle.example')
  }, 60_000)

  it('answers a session signed in on one process on the other', async () => {
    expect((await lead.call(apiB, 'GET', '/api/auth/me')).body.user.role).toBe('lead')
    expect((await operator.call(apiA, 'GET', '/api/auth/me')).body.user.role).toBe('operator')
  })

  it('keeps one history per unit when scans go through both processes', async () => {
    const serials = t.units.map((u) => u.serial)
    const codes = (await operator.call(apiA, 'GET', '/api/defect-codes')).body as {
      id: string
      code: string
    }[]
    const lowVout = codes.find((d) => d.code === 'L-VOUT')!.id
    const api = (i: number) => (i % 2 ? apiB : apiA)
    // Windings through both processes at once; each body also sent again to the other process,
    // as a station whose answer was lost would resend it.
    const windings = serials.map((s) => windingRun(t, s))
    const first = await Promise.all(
      windings.flatMap((body, i) => [
        operator.call(api(i), 'POST', '/api/step-runs', body),
        lead.call(api(i + 1), 'POST', '/api/step-runs', body),
      ]),
    )
    for (let i = 0; i < serials.length; i++) {
      const pair = [first[2 * i]!, first[2 * i + 1]!]
      expect(pair.map((r) => r.status).sort()).toEqual([200, 201])
      expect(pair[0]!.body.stepRun.id).toBe(pair[1]!.body.stepRun.id)
    }
    // Two different load tests of one unit at once, one on each process: one records.
    const [x, y] = await Promise.all([
      operator.call(apiA, 'POST', '/api/step-runs', loadTestRun(serials[0]!, 350)),
      lead.call(apiB, 'POST', '/api/step-runs', loadTestRun(serials[0]!, 350)),
    ])
    expect([x.status, y.status].sort()).toEqual([201, 409])
    // The rest alternate; unit 2 fails, and the lead disposes it on the other process.
    for (let i = 1; i < serials.length; i++) {
      const res = await operator.call(
        api(i),
        'POST',
        '/api/step-runs',
        loadTestRun(serials[i]!, i === 1 ? 340 : 350, i === 1 ? { defectCodeId: lowVout } : {}),
      )
      expect(res.status).toBe(201)
      if (i === 1) {
        const nc = res.body.nonconformanceId as string
        const disposed = await lead.call(
          api(i + 1),
          'POST',
          `/api/nonconformances/${nc}/disposition`,
          {
            disposition: 'rework',
            reworkToStepId: t.rev.steps[0]!.id,
            reason: 'rewind secondary',
          },
        )
        expect(disposed.status).toBe(200)
        expect(
          (await operator.call(api(i), 'POST', '/api/step-runs', windingRun(t, serials[i]!)))
            .status,
        ).toBe(201)
        expect(
          (await operator.call(api(i + 1), 'POST', '/api/step-runs', loadTestRun(serials[i]!, 350)))
            .status,
        ).toBe(201)
      }
    }

    const rows = await db().query<{
      serial: string
      step: number
      attempt: number
      result: string
      n: string
    }>(
      `SELECT u.serial, rs.position AS step, sr.attempt, sr.result,
              count(*) OVER (PARTITION BY sr.client_event_id) AS n
         FROM step_runs sr JOIN units u ON u.id = sr.unit_id JOIN route_steps rs ON rs.id = sr.step_id
        WHERE u.lot_id = :lotId ORDER BY u.serial, sr.finished_at, sr.id`,
      { replacements: { lotId: t.lot.id }, type: QueryTypes.SELECT },
    )
    expect(rows.every((r) => Number(r.n) === 1)).toBe(true)
    const history = (serial: string) =>
      rows.filter((r) => r.serial === serial).map((r) => `${r.step}/${r.attempt}/${r.result}`)
    // Positions start at 1 (winding) and 2 (load test); the reworked unit runs both again.
    const [s0, s1, ...rest] = serials
    expect(history(s0!)).toEqual(['1/1/pass', '2/1/pass'])
    expect(history(s1!)).toEqual(['1/1/pass', '2/1/fail', '1/2/pass', '2/2/pass'])
    for (const s of rest) expect(history(s)).toEqual(['1/1/pass', '2/1/pass'])
    const finished = await lead.call(apiB, 'GET', `/api/lots/${t.lot.id}/units`)
    expect(finished.body.every((u: { state: string }) => u.state === 'passed')).toBe(true)
  }, 90_000)

  it('makes each document once and sends each e-mail once', async () => {
    // Releasing the lot asked for its papers already; the two asked here come on top.
    const before = await Document.count({ where: { lotId: t.lot.id } })
    const travelers = await lead.call(apiA, 'POST', `/api/lots/${t.lot.id}/documents`, {
      kind: 'travelers',
    })
    const report = await lead.call(apiB, 'POST', `/api/lots/${t.lot.id}/documents`, {
      kind: 'lot_report',
    })
    expect([travelers.status, report.status]).toEqual([201, 201])
    const ids = [travelers.body.id as string, report.body.id as string]
    // Polled through both processes alternately, as a page would after a reload.
    let turn = 0
    for (const id of ids)
      await until(`document ${id}`, async () => {
        const res = await lead.call(turn++ % 2 ? apiB : apiA, 'GET', `/api/documents/${id}`)
        const doc = res.body as DocumentDto
        if (doc.status === 'failed') throw new Error(`document failed: ${doc.error}`)
        return doc.status === 'done' ? doc : null
      })
    expect(await Document.count({ where: { lotId: t.lot.id } })).toBe(before + 2)
    const rows = await Document.findAll({ where: { id: ids } })
    expect(rows.map((r) => r.status)).toEqual(['done', 'done'])
    for (const row of rows) {
      const file = await getFile(row.storageKey!)
      expect(createHash('sha256').update(file.body).digest('hex')).toBe(row.sha256)
      expect(row.storageKey).toBe(`documents/${row.sha256}`)
    }

    const to = `quality-${randomUUID().slice(0, 8)}@customer.example`
    const mailed = await lead.call(apiA, 'POST', `/api/documents/${ids[1]}/email`, { to: [to] })
    expect(mailed.status).toBe(202)
    const sent = await until('the e-mail to be sent', async () => {
      const e = await Email.findByPk(mailed.body.id as string)
      return e?.status === 'sent' ? e : null
    })
    expect(sent.attempts).toBe(1)
    const received = await until('the fake to file the e-mail', async () => {
      const got = await Email.findAll({ where: { status: 'received', messageId: sent.messageId } })
      return got.length ? got : null
    })
    expect(received).toHaveLength(1)
    expect(received[0]!.toAddresses).toEqual([to])
    expect(await Email.count({ where: { relatedId: ids[1], status: 'sent' } })).toBe(1)
  }, 150_000)

  it('ends a session on every process when it is signed out on one', async () => {
    expect((await operator.call(apiA, 'GET', '/api/auth/me')).status).toBe(200)
    const cookie = operator.cookie
    expect((await operator.call(apiB, 'POST', '/api/auth/logout')).status).toBe(204)
    await until(
      'process A to forget the session',
      async () => {
        const res = await fetch(`${apiA}/api/auth/me`, { headers: { cookie } })
        return res.status === 401 ? true : null
      },
      10_000,
    )
  })
})
