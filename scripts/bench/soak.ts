// Soak: `npx tsx scripts/bench/soak.ts [--minutes 5] [--stations 50]`; --help says more.
// Run it after `npm test` has prepared the services (it uses WAYMARK_DB, default waymark_bench_test).
import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3'
import pg from 'pg'
import { startApi, startAppProcess, stopAppProcesses, waitForOutput } from '../lib/appProcess'
import type { AppProcess } from '../lib/appProcess'
import { benchEnvironment, migrateBenchDatabase, percentile, signIn } from './lib'

benchEnvironment({ WAYMARK_REDIS_PREFIX: 'waymark-soak', S3_BUCKET: 'waymark-soak-test' })
process.env.S3_BUCKET ??= 'waymark-soak-test'
process.env.LOG_LEVEL ??= 'error'

const { values: args } = parseArgs({
  options: {
    minutes: { type: 'string', default: '5' },
    stations: { type: 'string', default: '50' },
    'think-ms': { type: 'string', default: '1000' },
    'fail-percent': { type: 'string', default: '4' },
    'baseline-seconds': { type: 'string', default: '30' },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/soak.ts [--minutes N] [--stations N] [--think-ms N]
                                   [--fail-percent N] [--baseline-seconds N]

Resets its own database (WAYMARK_DB, default waymark_bench_test), seeds a released two-step recipe
(winding with two readings, then inspection) and lots of it, and starts one API process (PORT=0,
no in-process workers) and one worker process, as production runs them. Then, over loopback:
  baseline   --baseline-seconds of GET /api/auth/me from the same --stations at the same pace:
             what any signed-in request costs at this load;
  soak       --minutes (default 5) of --stations simulated stations, each waiting about
             --think-ms (0.5 to 1.5 times, at random) between scans. Two thirds wind (readings,
             --fail-percent of them out of limits with a defect code), a third inspect the wound
             units. A lead disposes each open nonconformance every two seconds (rework to winding,
             or every third one scrap) and asks for a lot's travelers or lot report every 20 s.
Prints throughput, p50/p95/p99, answers by status, the API process's RSS, the database's
connections (pg_stat_activity) and the targets: no 5xx, no lost scan (201s vs rows), p95 <= 50 ms,
RSS growth < 50 MB.`)
  process.exit(0)
}
const MINUTES = Number(args.minutes)
const STATIONS = Math.max(3, Number(args.stations))
const THINK_MS = Number(args['think-ms'])
const FAIL_SHARE = Number(args['fail-percent']) / 100
const BASELINE_MS = Number(args['baseline-seconds']) * 1000
if (!(MINUTES > 0 && MINUTES <= 60)) throw new Error('--minutes: between 0 and 60')

await migrateBenchDatabase()
const { env } = await import('../../server/env')
// The bucket for the documents the lead asks for (the services make only the lanes' buckets).
const s3 = new S3Client({
  endpoint: env.s3.endpoint,
  forcePathStyle: true,
  region: env.s3.region,
  credentials: { accessKeyId: env.s3.accessKeyId, secretAccessKey: env.s3.secretAccessKey },
})
await s3.send(new CreateBucketCommand({ Bucket: env.s3.bucket })).catch((err: unknown) => {
  const name = (err as { name?: string }).name
  if (name !== 'BucketAlreadyOwnedByYou' && name !== 'BucketAlreadyExists') throw err
})
s3.destroy()
const { loadDemo } = await import('../../server/seed/demo')
const { seedBenchLot } = await import('./scanSeed')
const { DefectCode, Lot, RouteStep, Unit, closeDb } = await import('../../server/models')
await loadDemo({ onlyIfEmpty: false })
const winders = Math.round((STATIONS * 2) / 3)
// Enough units for every winder at its mean pace, with a third to spare (reworks come back too).
const wanted = Math.ceil((winders * MINUTES * 60_000 * 1.33) / Math.max(THINK_MS, 20)) + 100
const serials = await seedBenchLot(wanted, 'SK01')
const firstUnit = (await Unit.findOne({ where: { serial: serials[0]! } }))!
// The soak's lots only: the demo data has lots, step runs and documents of its own.
const { revisionId } = (await Lot.findByPk(firstUnit.lotId))!
const lotIds = (await Lot.findAll({ where: { revisionId }, attributes: ['id'] })).map((l) => l.id)
const winding = (await RouteStep.findByPk(firstUnit.currentStepId!))!
const defect = (await DefectCode.findAll({ order: [['code', 'ASC']] })).find((d) =>
  d.stationKinds.includes('winding'),
)!
await closeDb()

// The app as production runs it: its own processes, so their memory is theirs alone.
const children: AppProcess[] = []
const stop = () => stopAppProcesses(children)
process.on('SIGINT', () => void stop().then(() => process.exit(130)))
const api = await startApi('api', { WAYMARK_WORKERS: 'off' }, 120_000)
children.push(api.process)
const worker = startAppProcess('worker', 'server/workers/index.ts', { LOG_LEVEL: 'info' })
children.push(worker)
await waitForOutput(worker, /workers started/, 120_000)
const base = api.base
const operator = await signIn(base, 'operator@ferncastle.example')
const lead = await signIn(base, 'lead@ferncastle.example')

/** Resident memory of a process in MB, from /proc. */
function rssMb(pid: number): number {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+) kB/)
  return line ? Number(line[1]) / 1024 : NaN
}
const monitor = new pg.Client({ connectionString: env.databaseUrl })
await monitor.connect()
/** Connections to the soak's database, other than this monitor's own. */
async function connections(): Promise<{ total: number; active: number }> {
  const { rows } = await monitor.query<{ total: string; active: string }>(
    `SELECT count(*) AS total, count(*) FILTER (WHERE state = 'active') AS active
       FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()`,
  )
  return { total: Number(rows[0]!.total), active: Number(rows[0]!.active) }
}

interface Tally {
  times: number[]
  byStatus: Map<number | string, number>
}
const tally = (): Tally => ({ times: [], byStatus: new Map() })

/** Sends one request, timing it to the end of its body, and counts its answer in `into`. */
async function timed<T = unknown>(
  into: Tally,
  path: string,
  who: { cookie: string; token: string },
  body?: unknown,
): Promise<{ status: number; json: T | null }> {
  const t0 = performance.now()
  let status: number | string = 'network error'
  try {
    const res = await fetch(`${base}${path}`, {
      method: body === undefined ? 'GET' : 'POST',
      headers: {
        'content-type': 'application/json',
        cookie: who.cookie,
        'x-csrf-token': who.token,
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    })
    status = res.status
    const text = await res.text()
    return { status: res.status, json: text && res.ok ? (JSON.parse(text) as T) : null }
  } catch {
    return { status: 0, json: null }
  } finally {
    into.times.push(performance.now() - t0)
    into.byStatus.set(status, (into.byStatus.get(status) ?? 0) + 1)
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))
const think = () => sleep(THINK_MS * (0.5 + Math.random()))

/** `count` stations, each running `step` then thinking, until `endsAt`. */
async function stations(count: number, endsAt: number, step: (i: number) => Promise<void>) {
  await Promise.all(
    Array.from({ length: count }, async (_, i) => {
      await sleep(Math.random() * THINK_MS) // not all at once
      while (Date.now() < endsAt) {
        await step(i)
        await think()
      }
    }),
  )
}

// Warm-up, not counted: V8 compiles the hot paths.
const warm = tally()
for (let i = 0; i < 50; i++) await timed(warm, '/api/auth/me', operator)

console.error(`baseline: ${BASELINE_MS / 1000} s of GET /api/auth/me from ${STATIONS} stations`)
const baseline = tally()
await stations(STATIONS, Date.now() + BASELINE_MS, () =>
  timed(baseline, '/api/auth/me', operator).then(() => undefined),
)

const scans = tally()
const leadWork = tally()
const rework: string[] = []
const toInspect: string[] = []
const acknowledged = new Set<string>()
let nextUnit = 0
let starved = 0
let documentsAsked = 0
const rss0 = rssMb(api.process.child.pid!)
const workerRss0 = rssMb(worker.child.pid!)
const conn0 = await connections()
let connMax = conn0
let rssMax = rss0
const sampler = setInterval(() => {
  rssMax = Math.max(rssMax, rssMb(api.process.child.pid!))
  void connections().then((c) => {
    if (c.total > connMax.total) connMax = c
  })
}, 5000)

async function scan(body: Record<string, unknown>) {
  const res = await timed<{ stepRun: { result: string } }>(scans, '/api/step-runs', operator, body)
  if (res.status === 201) acknowledged.add(body.clientEventId as string)
  return res
}

const soakMs = MINUTES * 60_000
const soakEnds = Date.now() + soakMs
console.error(
  `soak: ${MINUTES} min, ${winders} winding and ${STATIONS - winders} inspection stations`,
)
const t0 = performance.now()
await Promise.all([
  stations(winders, soakEnds, async () => {
    const serial = rework.shift() ?? serials[nextUnit++]
    if (!serial) return void starved++
    const isFail = Math.random() < FAIL_SHARE
    const res = await scan({
      clientEventId: randomUUID(),
      serial,
      stationCode: 'WND-1',
      values: { turns: 92, l_sec: isFail ? 40 : 25.4 },
      ...(isFail ? { defectCodeId: defect.id } : {}),
    })
    if (res.status === 201 && res.json?.stepRun.result === 'pass') toInspect.push(serial)
  }),
  stations(STATIONS - winders, soakEnds, async () => {
    const serial = toInspect.shift()
    if (!serial) return
    await scan({ clientEventId: randomUUID(), serial, stationCode: 'INS-1', values: {} })
  }),
  // The lead: disposes what failed, and now and then prints a lot's papers.
  stations(1, soakEnds, async () => {
    const open = await timed<{ id: string; serial: string }[]>(
      leadWork,
      '/api/nonconformances?status=open',
      lead,
    )
    for (const [i, nc] of (open.json ?? []).entries()) {
      const isScrap = i % 3 === 2
      const res = await timed(leadWork, `/api/nonconformances/${nc.id}/disposition`, lead, {
        disposition: isScrap ? 'scrap' : 'rework',
        reworkToStepId: isScrap ? null : winding.id,
        reason: isScrap ? 'core cracked' : 'rewind',
      })
      if (res.status === 200 && !isScrap) rework.push(nc.serial)
    }
    if (Date.now() > (documentsAsked + 1) * 20_000 + (soakEnds - soakMs)) {
      const lotId = lotIds[documentsAsked % lotIds.length]!
      const kind = documentsAsked % 2 ? 'lot_report' : 'travelers'
      await timed(leadWork, `/api/lots/${lotId}/documents`, lead, { kind })
      documentsAsked++
    }
    await sleep(Math.max(0, 2000 - THINK_MS)) // about every two seconds in all
  }),
])
const seconds = (performance.now() - t0) / 1000
clearInterval(sampler)
const rss1 = rssMb(api.process.child.pid!)
const workerRss1 = rssMb(worker.child.pid!)
const conn1 = await connections()

// Every acknowledged scan must be a row; rows the soak was not told about would be lost answers.
const ids = [...acknowledged]
const { rows } = await monitor.query<{ n: string }>(
  'SELECT count(*) AS n FROM step_runs WHERE client_event_id = ANY($1::uuid[])',
  [ids],
)
const stored = Number(rows[0]!.n)
const allRuns = Number(
  (
    await monitor.query<{ n: string }>(
      `SELECT count(*) AS n FROM step_runs sr JOIN units u ON u.id = sr.unit_id
        WHERE u.lot_id = ANY($1::uuid[])`,
      [lotIds],
    )
  ).rows[0]!.n,
)
const docs = (
  await monitor.query<{ status: string; n: string }>(
    `SELECT status, count(*) AS n FROM documents WHERE lot_id = ANY($1::uuid[])
      GROUP BY status ORDER BY status`,
    [lotIds],
  )
).rows
await monitor.end()
await stop()

const sorted = (t: Tally) => [...t.times].sort((a, b) => a - b)
const ms = (t: Tally, p: number) => `${percentile(sorted(t), p).toFixed(1)} ms`
const statuses = (t: Tally) =>
  [...t.byStatus]
    .sort(([a], [b]) => String(a).localeCompare(String(b)))
    .map(([s, n]) => `${s}: ${n}`)
    .join(', ')
const line = (name: string, t: Tally, secs: number) =>
  `  ${name.padEnd(24)} ${(t.times.length / secs).toFixed(1).padStart(6)} req/s   ` +
  `p50 ${ms(t, 50)}  p95 ${ms(t, 95)}  p99 ${ms(t, 99)}   n ${t.times.length}   [${statuses(t)}]`
const count5xx = (t: Tally) =>
  [...t.byStatus].reduce(
    (sum, [s, n]) => sum + (typeof s === 'number' && (s >= 500 || s === 0) ? n : 0),
    0,
  )
const p95 = percentile(sorted(scans), 95)
const met = (ok: boolean) => (ok ? 'met' : 'NOT MET')

console.log(
  `\nsoak: ${STATIONS} stations, think ${THINK_MS} ms ±50 %, ${seconds.toFixed(0)} s, loopback`,
)
console.log(line('baseline GET /auth/me', baseline, BASELINE_MS / 1000))
console.log(line('POST /api/step-runs', scans, seconds))
console.log(line('lead (NCs, documents)', leadWork, seconds))
console.log(
  `  units left unscanned when winders ran dry: ${starved} times; documents asked ${documentsAsked}: ` +
    docs.map((d) => `${d.status} ${d.n}`).join(', '),
)
console.log(
  `  API RSS ${rss0.toFixed(0)} MB at start, ${rss1.toFixed(0)} MB at end (max ${rssMax.toFixed(0)} MB);` +
    ` worker ${workerRss0.toFixed(0)} -> ${workerRss1.toFixed(0)} MB`,
)
console.log(
  `  PostgreSQL connections (total / active): start ${conn0.total}/${conn0.active},` +
    ` max ${connMax.total}/${connMax.active}, end ${conn1.total}/${conn1.active}`,
)
console.log(
  `  scans acknowledged 201: ${ids.length}; their rows: ${stored}; step runs of the soak's lots: ${allRuns}`,
)
const errors = count5xx(scans) + count5xx(leadWork) + count5xx(baseline)
console.log('targets:')
console.log(`  no 5xx (or dropped connection): ${errors} — ${met(errors === 0)}`)
console.log(
  `  no lost scan: ${ids.length - stored} lost — ${met(stored === ids.length && allRuns === stored)}`,
)
console.log(
  `  scan p95 <= 50 ms: ${p95.toFixed(1)} ms (baseline ${percentile(sorted(baseline), 95).toFixed(1)} ms) — ${met(p95 <= 50)}`,
)
console.log(`  RSS growth < 50 MB: ${(rss1 - rss0).toFixed(1)} MB — ${met(rss1 - rss0 < 50)}`)
process.exit(0)
