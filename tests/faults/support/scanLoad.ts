import type pg from 'pg'
import { sleep, waitFor } from '../../../scripts/lib/proc'
import type { FaultLot } from './floor'
import { loadScan, windingScan } from './floor'
import type { HttpClient } from './http'

/** One answer the API gave to a scan, when it came. */
export interface Answer {
  at: number
  status: number
  error?: string
  message?: string
  ms: number
}

/** A scan a client sent until the API acknowledged it (2xx), with every answer on the way. */
export interface Submission {
  clientEventId: string
  serial: string
  answers: Answer[]
  /** The step run id of the acknowledging answer; null if it never came. */
  runId: string | null
}

export interface ScanLoad {
  submissions: Submission[]
  /** Resolves when every client has gone through its units (or given up on one). */
  done: Promise<void>
  acked: () => number
  total: number
}

/** How long a client keeps sending one scan before it gives up on it (a failure of the test). */
const GIVE_UP_MS = 60_000
/** A tablet's pause before it sends an unacknowledged scan again. */
const RETRY_PAUSE_MS = 100

/**
 * Sends one scan until the API acknowledges it, the same body (and so the same client event id)
 * every time, as the Floor does after a failed or unanswered submission. A 4xx is an answer the
 * operator must act on, so it ends the retries.
 */
async function sendUntilAcked(
  client: HttpClient,
  body: { clientEventId: string; serial: string },
  sub: Submission,
): Promise<void> {
  const deadline = Date.now() + GIVE_UP_MS
  while (Date.now() < deadline) {
    const reply = await client.post('/api/step-runs', body)
    const answer: Answer = { at: Date.now(), status: reply.status, ms: reply.ms }
    if (reply.body && typeof reply.body === 'object') {
      answer.error = reply.body.error
      answer.message = reply.body.message
    }
    sub.answers.push(answer)
    if (reply.status >= 200 && reply.status < 300) {
      sub.runId = reply.body.stepRun.id
      break
    }
    if (reply.status >= 400 && reply.status < 500) break
    await sleep(RETRY_PAUSE_MS)
  }
}

/**
 * Starts the clients: client i takes units i, i + n, i + 2n, … and scans each through winding
 * (the locked path: it consumes a part) and then the load test (the unlocked path).
 */
export function startScanLoad(clients: HttpClient[], lot: FaultLot): ScanLoad {
  const submissions: Submission[] = []
  let acked = 0
  const runClient = async (client: HttpClient, index: number) => {
    for (let u = index; u < lot.serials.length; u += clients.length) {
      const serial = lot.serials[u]!
      for (const body of [windingScan(lot, serial), loadScan(serial)]) {
        const sub: Submission = {
          clientEventId: body.clientEventId,
          serial: body.serial,
          answers: [],
          runId: null,
        }
        submissions.push(sub) // seen while it is still being sent
        await sendUntilAcked(client, body, sub)
        if (!sub.runId) return // the unit cannot go on; the checks report it
        acked++
      }
    }
  }
  const done = Promise.all(clients.map(runClient)).then(() => undefined)
  return { submissions, done, acked: () => acked, total: lot.serials.length * 2 }
}

/** Waits until `share` of the load's scans are acknowledged (the fault then hits mid-run). */
export async function untilShareAcked(load: ScanLoad, share: number): Promise<void> {
  if (!(await waitFor(() => load.acked() >= load.total * share, 60_000)))
    throw new Error(`only ${load.acked()} of ${load.total} scans acknowledged after 60 s`)
}

export interface LoadFigures {
  submissions: number
  acked: number
  answers: number
  retries: number
  unavailable: number
  maxMs: number
  maxFailedMs: number
  /** The longest a failed answer took after the fault began (its wait while the database was away). */
  maxWaitInFaultMs: number
  /** Every status other than 2xx and 503, with its error code: should be empty. */
  unexpected: string[]
}

/** Counts what the clients saw; `faultAt` is when the fault began. */
export function figures(load: ScanLoad, faultAt: number): LoadFigures {
  const answers = load.submissions.flatMap((s) => s.answers)
  const failed = answers.filter((a) => a.status < 200 || a.status >= 300)
  return {
    submissions: load.submissions.length,
    acked: load.submissions.filter((s) => s.runId).length,
    answers: answers.length,
    retries: answers.length - load.submissions.length,
    unavailable: failed.filter((a) => a.status === 503).length,
    maxMs: Math.max(0, ...answers.map((a) => a.ms)),
    maxFailedMs: Math.max(0, ...failed.map((a) => a.ms)),
    maxWaitInFaultMs: Math.max(0, ...failed.map((a) => a.at - Math.max(faultAt, a.at - a.ms))),
    unexpected: failed
      .filter((a) => a.status !== 503)
      .map((a) => `${a.status} ${a.error ?? ''} ${a.message ?? ''}`),
  }
}

export interface StoredLot {
  /** Acknowledged event ids that are not stored exactly once with the acknowledged run id. */
  lostOrDoubled: string[]
  /** Units that did not run each of the two steps exactly once, first attempt, and pass. */
  wrongUnits: string[]
  stepRuns: number
  consumptions: number
  quantityRemaining: number
  auditRows: number
}

/** Reads back, as the owner, what the database holds for the lot and the acknowledged scans. */
export async function storedLot(db: pg.Client, lot: FaultLot, load: ScanLoad): Promise<StoredLot> {
  const acked = load.submissions.filter((s) => s.runId)
  const { rows: runs } = await db.query<{ client_event_id: string; id: string }>(
    'SELECT client_event_id, id FROM step_runs WHERE client_event_id = ANY($1::uuid[])',
    [acked.map((s) => s.clientEventId)],
  )
  const byEvent = new Map<string, string[]>()
  for (const r of runs)
    byEvent.set(r.client_event_id, [...(byEvent.get(r.client_event_id) ?? []), r.id])
  const lostOrDoubled = acked
    .filter((s) => {
      const ids = byEvent.get(s.clientEventId) ?? []
      return ids.length !== 1 || ids[0] !== s.runId
    })
    .map((s) => s.clientEventId)
  const { rows: units } = await db.query<{
    serial: string
    state: string
    run_count: number
    runs: string
    steps: string
    max_attempt: number | null
    fails: string
    audits: string
  }>(
    `SELECT u.serial, u.state, u.run_count,
            (SELECT count(*) FROM step_runs sr WHERE sr.unit_id = u.id) AS runs,
            (SELECT count(DISTINCT sr.step_id) FROM step_runs sr WHERE sr.unit_id = u.id) AS steps,
            (SELECT max(sr.attempt) FROM step_runs sr WHERE sr.unit_id = u.id) AS max_attempt,
            (SELECT count(*) FROM step_runs sr WHERE sr.unit_id = u.id AND sr.result <> 'pass') AS fails,
            (SELECT count(*) FROM audit_events a
              WHERE a.entity = 'unit' AND a.entity_id = u.id::text AND a.action = 'step_run.record') AS audits
       FROM units u WHERE u.lot_id = $1 ORDER BY u.serial`,
    [lot.lotId],
  )
  const wrongUnits = units
    .filter(
      (u) =>
        u.state !== 'passed' ||
        Number(u.run_count) !== 2 ||
        Number(u.runs) !== 2 ||
        Number(u.steps) !== 2 ||
        u.max_attempt !== 1 ||
        Number(u.fails) !== 0 ||
        Number(u.audits) !== 2,
    )
    .map((u) => `${u.serial}: ${u.state}, ${u.runs} runs, ${u.audits} audit rows`)
  const [totals] = (
    await db.query<{ step_runs: string; consumptions: string; remaining: number; audits: string }>(
      `SELECT (SELECT count(*) FROM step_runs sr JOIN units u ON u.id = sr.unit_id
                WHERE u.lot_id = $1) AS step_runs,
              (SELECT count(*) FROM consumptions c JOIN units u ON u.id = c.unit_id
                WHERE u.lot_id = $1) AS consumptions,
              (SELECT quantity_remaining FROM component_lots WHERE internal_code = $2) AS remaining,
              (SELECT count(*) FROM audit_events a JOIN units u ON a.entity_id = u.id::text
                WHERE u.lot_id = $1 AND a.entity = 'unit' AND a.action = 'step_run.record') AS audits`,
      [lot.lotId, lot.componentLotCode],
    )
  ).rows
  return {
    lostOrDoubled,
    wrongUnits,
    stepRuns: Number(totals!.step_runs),
    consumptions: Number(totals!.consumptions),
    quantityRemaining: Number(totals!.remaining),
    auditRows: Number(totals!.audits),
  }
}
