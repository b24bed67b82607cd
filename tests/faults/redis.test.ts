// Redis away: scans still record, jobs wait in PostgreSQL and each runs once when Redis returns;
// a worker killed mid-job leaves its job to another. Runs on a stack of its own (support/stack.ts).
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import type pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { waitFor } from '../../scripts/lib/proc'
import { releasedLot, windingScan } from './support/floor'
import type { FaultLot, Roles } from './support/floor'
import { signedIn } from './support/http'
import type { HttpClient } from './support/http'
import { killChild, startApp, startWorkers, stopChild, tail } from './support/processes'
import type { App, Child } from './support/processes'
import { ownerClient, startRedisOf, startStack, stopRedisOf, stopStack } from './support/stack'
import type { Stack } from './support/stack'

/** Workers that give up a dead holder's job after 3 s, and a traveler page that takes 0.4 s. */
const WORKER_ENV = {
  LOG_LEVEL: 'info',
  WAYMARK_JOB_LOCK_MS: '3000',
  WAYMARK_JOB_STALL_CHECK_MS: '1000',
  WAYMARK_TEST_RENDER_PAUSE_MS: '400',
}

interface DocumentRow {
  id: string
  kind: string
  status: string
  progress: number
  storage_key: string | null
}

interface EmailRow {
  id: string
  status: string
  attempts: number
  message_id: string | null
  received: string
}

describe('jobs while Redis goes away', () => {
  let stack: Stack | undefined
  let app: App | undefined
  let workers: Child | undefined
  let db: pg.Client | undefined
  let s3: S3Client | undefined
  let roles: Roles
  let operator: HttpClient

  beforeAll(async () => {
    stack = await startStack('redis')
    app = await startApp(stack)
    workers = await startWorkers(stack, WORKER_ENV)
    const [engineer, lead, stores, op] = await Promise.all(
      ['engineer', 'lead', 'stores', 'operator'].map((r) => signedIn(app!.baseUrl, r)),
    )
    roles = { engineer: engineer!, lead: lead!, stores: stores! }
    operator = op!
    db = await ownerClient(stack)
    s3 = new S3Client({
      endpoint: stack.config.s3Endpoint,
      forcePathStyle: true,
      region: 'us-east-1',
      credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    })
    console.log(`faults/redis stack: ${stack.log.filter((l) => / s$/.test(l)).join(', ')}`)
  })

  afterAll(async () => {
    s3?.destroy()
    await db?.end().catch(() => undefined)
    if (workers) await stopChild(workers)
    if (app) await stopChild(app)
    if (stack) await stopStack(stack)
  })

  const lotDocuments = async (lotId: string) =>
    (
      await db!.query<DocumentRow>(
        'SELECT id, kind, status, progress, storage_key FROM documents WHERE lot_id = $1 ORDER BY kind',
        [lotId],
      )
    ).rows

  /** E-mails about `entity` `ids`, each with how many copies the SMTP fake filed. */
  const emailsAbout = async (entity: string, ids: string[]) =>
    (
      await db!.query<EmailRow>(
        `SELECT e.id, e.status, e.attempts, e.message_id,
                -- Filed by the relay: a receipt on the row, or (before receipts) a copy.
                ((e.receipt_at IS NOT NULL)::int + (SELECT count(*) FROM emails r
                  WHERE r.status = 'received' AND r.message_id = e.message_id))::text AS received
           FROM emails e WHERE e.related_entity = $1 AND e.related_id = ANY($2::uuid[])`,
        [entity, ids],
      )
    ).rows

  /** Every object under documents/ in the bucket. */
  async function storedDocumentKeys(): Promise<string[]> {
    const out = await s3!.send(
      new ListObjectsV2Command({ Bucket: stack!.bucket, Prefix: 'documents/' }),
    )
    return (out.Contents ?? []).map((o) => o.Key!).sort()
  }

  /** The object store holds one file per finished document and nothing else. */
  async function expectOneFilePerDocument(): Promise<void> {
    const { rows } = await db!.query<{ storage_key: string }>(
      "SELECT DISTINCT storage_key FROM documents WHERE status = 'done' ORDER BY storage_key",
    )
    expect(await storedDocumentKeys()).toEqual(rows.map((r) => r.storage_key))
  }

  async function untilDone(lotId: string): Promise<DocumentRow[]> {
    let docs: DocumentRow[] = []
    await waitFor(async () => {
      docs = await lotDocuments(lotId)
      return docs.length > 0 && docs.every((d) => d.status === 'done' || d.status === 'failed')
    }, 90_000)
    return docs
  }

  it('records scans while Redis is stopped, and runs each waiting job once when it returns', async () => {
    const { lead } = roles
    // Before the outage: a lot whose printed papers are made, and its report to e-mail later.
    const tenLot: FaultLot = await releasedLot(roles, 10)
    const report = (
      await lead.must('POST', `/api/lots/${tenLot.lotId}/documents`, { kind: 'lot_report' }, 201)
    ).body as { id: string }
    await untilDone(tenLot.lotId)

    await stopRedisOf(stack!)
    const downAt = Date.now()
    const health = await operator.get('/api/health')
    expect(health.status).toBe(503)
    expect(health.body).toMatchObject({ status: 'degraded', db: 'ok', redis: 'down' })
    // People can still sign in: the password limits count in the API's memory meanwhile.
    const late = await signedIn(app!.baseUrl, 'operator')
    expect((await late.get('/api/auth/me')).status).toBe(200)

    // Scans record: eight passes and two failures at winding, a first-pass yield of 80 % against
    // the recipe's 90 % threshold with 10 first attempts (FPY_MIN_FIRST_ATTEMPTS): an alert is due.
    const scans = await Promise.all(
      tenLot.serials.map((serial, i) =>
        operator.post(
          '/api/step-runs',
          windingScan(
            tenLot,
            serial,
            i < 2 ? { values: { l_sec: 40 }, defectCodeId: tenLot.defectCodeId } : {},
          ),
        ),
      ),
    )
    expect(scans.map((s) => s.status)).toEqual(tenLot.serials.map(() => 201))
    const slowestScanMs = Math.max(...scans.map((s) => s.ms))
    // A lot released now asks for its travelers and labels; the report goes out by e-mail.
    const threeLot = await releasedLot(roles, 3)
    const mailed = await lead.post(`/api/documents/${report.id}/email`, {
      to: ['lead@ferncastle.example'],
    })
    expect(mailed.status).toBe(202)

    // The API that took those requests goes away with whatever it held in memory: from here the
    // jobs exist only as rows in PostgreSQL.
    await killChild(app!, 'SIGKILL')
    app = await startApp(stack!, {}, Number(new URL(app!.baseUrl).port))
    expect((await lotDocuments(threeLot.lotId)).map((d) => d.status)).toEqual(['queued', 'queued'])
    expect((await emailsAbout('document', [report.id])).map((e) => e.status)).toEqual(['queued'])
    const alertsNow = await db!.query('SELECT id FROM alerts WHERE lot_id = $1', [tenLot.lotId])
    expect(alertsNow.rowCount).toBe(0)

    await startRedisOf(stack!)
    const upAt = Date.now()
    const docs = await untilDone(threeLot.lotId)
    const docsAt = Date.now()
    expect(docs.map((d) => [d.kind, d.status])).toEqual([
      ['labels', 'done'],
      ['travelers', 'done'],
    ])
    let alertIds: string[] = []
    const isMailed = await waitFor(async () => {
      const { rows } = await db!.query<{ id: string }>('SELECT id FROM alerts WHERE lot_id = $1', [
        tenLot.lotId,
      ])
      alertIds = rows.map((r) => r.id)
      const mails = [
        ...(await emailsAbout('document', [report.id])),
        ...(await emailsAbout('alert', alertIds)),
      ]
      // The document's e-mail and the lead's first alert e-mail; later alerts of the same hour
      // wait for the lead's digest (WAYMARK_ALERT_DIGEST_MINUTES), which is not due yet.
      return alertIds.length > 0 && mails.length >= 2 && mails.every((m) => m.status !== 'queued')
    }, 90_000)
    const mailedAt = Date.now()
    expect(isMailed, `mail still waiting:\n${tail(workers!)}`).toBe(true)
    const fpy = await db!.query(
      "SELECT id FROM alerts WHERE lot_id = $1 AND step_id = $2 AND rule = 'fpy_below_threshold'",
      [tenLot.lotId, tenLot.windingStepId],
    )
    expect(fpy.rowCount).toBe(1)
    // Each e-mail: sent after one attempt, filed once by the relay.
    for (const mail of [
      ...(await emailsAbout('document', [report.id])),
      ...(await emailsAbout('alert', alertIds)),
    ])
      expect(mail).toMatchObject({ status: 'sent', attempts: 1, received: '1' })
    // One lead, so one e-mail now for all the alerts, however many episodes were raised.
    expect(await emailsAbout('alert', alertIds)).toHaveLength(1)
    await expectOneFilePerDocument()
    expect((await operator.get('/api/health')).status).toBe(200)
    expect(app.exit).toBeNull()
    expect(workers!.exit, `the workers exited:\n${tail(workers!)}`).toBeNull()
    console.log(
      `faults/redis: Redis down ${((upAt - downAt) / 1000).toFixed(1)} s; 10 scans recorded ` +
        `meanwhile (slowest ${slowestScanMs.toFixed(0)} ms); 2 documents, the step runs for ` +
        `${alertIds.length} alerts and 1 e-mail waited in PostgreSQL; documents done ` +
        `${((docsAt - upAt) / 1000).toFixed(1)} s and mail sent ` +
        `${((mailedAt - upAt) / 1000).toFixed(1)} s after Redis was back`,
    )
  })

  it('runs a travelers job again after its worker is killed, leaving one file', async () => {
    const lot = await releasedLot(roles, 6)
    let travelers: DocumentRow | undefined
    const isRunning = await waitFor(async () => {
      travelers = (await lotDocuments(lot.lotId)).find((d) => d.kind === 'travelers')
      return travelers?.status === 'running' && travelers.progress > 0
    }, 60_000)
    expect(isRunning, 'the travelers render never got going').toBe(true)
    await killChild(workers!, 'SIGKILL')
    const killedAt = Date.now()
    expect((await lotDocuments(lot.lotId)).find((d) => d.kind === 'travelers')?.status).toBe(
      'running',
    )
    workers = await startWorkers(stack!, WORKER_ENV)
    const docs = await untilDone(lot.lotId)
    const doneAt = Date.now()
    expect(docs.map((d) => [d.kind, d.status])).toEqual([
      ['labels', 'done'],
      ['travelers', 'done'],
    ])
    await expectOneFilePerDocument()
    console.log(
      `faults/redis kill: travelers killed at ${travelers!.progress} %; done again ` +
        `${((doneAt - killedAt) / 1000).toFixed(1)} s after the SIGKILL (lock 3 s, stall check 1 s)`,
    )
  })
})
