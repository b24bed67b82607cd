// Nothing acknowledged is lost: scans from 16 tablets while PostgreSQL restarts, and while their
// connections are cut in the middle of a transaction. Runs on a stack of its own (support/stack.ts).
import type pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { waitFor } from '../../scripts/lib/proc'
import { releasedLot } from './support/floor'
import type { Roles } from './support/floor'
import { signedIn } from './support/http'
import type { HttpClient } from './support/http'
import { startApp, stopChild, tail } from './support/processes'
import type { App } from './support/processes'
import { figures, startScanLoad, storedLot, untilShareAcked } from './support/scanLoad'
import type { ScanLoad } from './support/scanLoad'
import {
  ownerClient,
  startDatabase,
  startStack,
  stopDatabase,
  stopStack,
  superSql,
} from './support/stack'
import type { Stack } from './support/stack'

const CLIENTS = 16
const UNAVAILABLE = {
  error: 'database_unavailable',
  message: 'the database is not reachable; try again in a moment',
}
/**
 * The longest a request may wait, once the database has gone away, before it is answered ("a few
 * seconds"). Counted from the fault: on a busy machine a request may already have queued for a
 * while before it.
 */
const MAX_FAILED_MS = 5000

describe('scans while the database goes away', () => {
  let stack: Stack | undefined
  let app: App | undefined
  let db: pg.Client | undefined
  let roles: Roles
  let operators: HttpClient[]

  beforeAll(async () => {
    stack = await startStack('db')
    // The killer below needs to see and end the app's sessions without being a superuser.
    await superSql(stack, 'GRANT pg_signal_backend, pg_read_all_stats TO waymark_owner;')
    app = await startApp(stack)
    const url = app.baseUrl
    const [engineer, lead, stores] = await Promise.all(
      ['engineer', 'lead', 'stores'].map((r) => signedIn(url, r)),
    )
    roles = { engineer: engineer!, lead: lead!, stores: stores! }
    operators = []
    for (let i = 0; i < CLIENTS; i++) operators.push(await signedIn(url, 'operator'))
    db = await ownerClient(stack)
    console.log(`faults/db stack: ${stack.log.filter((l) => / s$/.test(l)).join(', ')}`)
  })

  afterAll(async () => {
    await db?.end().catch(() => undefined)
    if (app) await stopChild(app)
    if (stack) await stopStack(stack)
  })

  /** Checks what the clients saw and what the database holds, and returns the figures. */
  async function expectNothingLost(
    lot: Awaited<ReturnType<typeof releasedLot>>,
    load: ScanLoad,
    faultAt: number,
  ) {
    await load.done
    const seen = figures(load, faultAt)
    expect(seen.unexpected, 'answers other than 2xx and 503').toEqual([])
    expect(seen.submissions).toBe(load.total)
    expect(seen.acked).toBe(load.total)
    const failed = load.submissions.flatMap((s) => s.answers).filter((a) => a.status === 503)
    for (const a of failed) expect({ error: a.error, message: a.message }).toEqual(UNAVAILABLE)
    expect(seen.maxWaitInFaultMs).toBeLessThan(MAX_FAILED_MS)
    const stored = await storedLot(db!, lot, load)
    expect(stored.lostOrDoubled, 'acknowledged scans not stored exactly once').toEqual([])
    expect(stored.wrongUnits, 'units that skipped or repeated a step').toEqual([])
    expect(stored.stepRuns).toBe(load.total)
    expect(stored.auditRows).toBe(load.total)
    expect(stored.consumptions).toBe(lot.serials.length)
    expect(stored.quantityRemaining).toBe(0)
    expect(app!.exit, `the API exited:\n${tail(app!)}`).toBeNull()
    const health = await operators[0]!.get('/api/health')
    expect(health.status).toBe(200)
    return seen
  }

  it('acknowledges each scan once across a restart of PostgreSQL, with 503s meanwhile', async () => {
    const lot = await releasedLot(roles, CLIENTS * 6)
    const load = startScanLoad(operators, lot)
    await untilShareAcked(load, 0.25)
    const downAt = Date.now()
    await stopDatabase(stack!)
    const stoppedAt = Date.now()
    // Held down until every tablet has been told so at least once.
    const waiting = () => Math.min(CLIENTS, load.total - load.acked())
    await waitFor(() => operatorsTold(load, stoppedAt) >= waiting(), 15_000)
    await startDatabase(stack!)
    const upAt = Date.now()
    // The test's own connection went with the restart.
    await db!.end().catch(() => undefined)
    db = await ownerClient(stack!)
    const recovered = await waitFor(
      () => load.submissions.some((s) => s.answers.some((a) => a.at > upAt && a.status < 300)),
      30_000,
    )
    const recoveredAt = Date.now()
    expect(recovered, 'no scan acknowledged after the restart').toBe(true)
    const slow = load.submissions
      .flatMap((s) => s.answers)
      .filter((a) => a.status !== 201 && a.ms > 2000)
      .map((a) => `${a.status} ${a.ms.toFixed(0)} ms ending ${a.at - downAt} ms after the stop`)
    if (slow.length) console.log(`faults/db slow failures: ${slow.join('; ')}`)
    console.log(`faults/db stop took ${stoppedAt - downAt} ms, start ${upAt - stoppedAt} ms`)
    const seen = await expectNothingLost(lot, load, downAt)
    expect(seen.unavailable).toBeGreaterThan(0)
    const firstAck = Math.min(
      ...load.submissions.flatMap((s) =>
        s.answers.filter((a) => a.at > upAt && a.status < 300).map((a) => a.at),
      ),
    )
    console.log(
      `faults/db restart: ${load.total} scans from ${CLIENTS} clients; database down ` +
        `${((upAt - downAt) / 1000).toFixed(1)} s; ${seen.unavailable} answers 503 (slowest ` +
        `${seen.maxFailedMs.toFixed(0)} ms, at most ${seen.maxWaitInFaultMs.toFixed(0)} ms of it ` +
        `after the stop); ${seen.retries} retries; first scan acknowledged ` +
        `${((firstAck - upAt) / 1000).toFixed(2)} s after the database was back ` +
        `(seen at ${((recoveredAt - upAt) / 1000).toFixed(1)} s); slowest answer ${seen.maxMs.toFixed(0)} ms`,
    )
  })

  it('acknowledges each scan once when connections are cut mid-transaction', async () => {
    const lot = await releasedLot(roles, CLIENTS * 8)
    const load = startScanLoad(operators, lot)
    await untilShareAcked(load, 0.15)
    const cut = { inTransaction: 0, midStatement: 0, rounds: 0 }
    const cutAt = Date.now()
    const deadline = Date.now() + 30_000
    // Ends the app's sessions that are inside a transaction: between the statements of the locked
    // path ('idle in transaction') or in the middle of one.
    while (Date.now() < deadline && load.acked() < load.total && cut.inTransaction < 3) {
      cut.rounds++
      // MATERIALIZED: the filter must pick the targets before any is terminated (a plain WHERE
      // may call pg_terminate_backend on rows the other conditions would have left out).
      const { rows } = await db!.query<{ state: string }>(
        `WITH targets AS MATERIALIZED (
           SELECT pid, state FROM pg_stat_activity
            WHERE datname = current_database() AND usename = 'waymark_app'
              AND backend_type = 'client backend' AND xact_start IS NOT NULL)
         SELECT state FROM targets WHERE pg_terminate_backend(pid)`,
      )
      for (const r of rows) {
        if (r.state === 'idle in transaction') cut.inTransaction++
        else cut.midStatement++
      }
    }
    // And once every connection of the app, the auth cache's LISTEN among them.
    const { rows: all } = await db!.query<{ n: string }>(
      `WITH targets AS MATERIALIZED (
         SELECT pid FROM pg_stat_activity
          WHERE datname = current_database() AND usename = 'waymark_app'
            AND backend_type = 'client backend')
       SELECT count(*) AS n FROM targets WHERE pg_terminate_backend(pid)`,
    )
    const seen = await expectNothingLost(lot, load, cutAt)
    expect(cut.inTransaction, 'no connection was cut inside a scan transaction').toBeGreaterThan(0)
    // The auth cache listens again (it reconnects by itself, every 2 s until it can).
    await operators[0]!.get('/api/auth/me')
    const isListening = await waitFor(async () => {
      const { rows } = await db!.query<{ n: string }>(
        `SELECT count(*) AS n FROM pg_stat_activity
          WHERE datname = current_database() AND usename = 'waymark_app'
            AND query = 'LISTEN waymark_auth'`,
      )
      return Number(rows[0]!.n) > 0
    }, 15_000)
    expect(isListening, 'the auth cache did not listen again').toBe(true)
    console.log(
      `faults/db cut: ${load.total} scans; ${cut.inTransaction} connections cut inside a ` +
        `transaction and ${cut.midStatement} mid-statement over ${cut.rounds} rounds, then ` +
        `${all[0]!.n} at once; ${seen.unavailable} answers 503 (slowest ` +
        `${seen.maxFailedMs.toFixed(0)} ms, at most ${seen.maxWaitInFaultMs.toFixed(0)} ms of it ` +
        `after the first cut); ${seen.retries} retries; slowest answer ` +
        `${seen.maxMs.toFixed(0)} ms`,
    )
  })
})

/** How many scans sent after `since` were answered 503: the tablets told the database is away. */
function operatorsTold(load: ScanLoad, since: number): number {
  return load.submissions.filter((s) => s.answers.some((a) => a.at >= since && a.status === 503))
    .length
}
