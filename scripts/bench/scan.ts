// Benchmark of the scan route: `npx tsx scripts/bench/scan.ts [--units 2000] [--connections 32]`.
// Run it after `npm test` has prepared the services (it uses WAYMARK_DB, default waymark_bench).
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
import inspector from 'node:inspector/promises'
import { parseArgs } from 'node:util'
import autocannon from 'autocannon'
import express from 'express'
import pg from 'pg'
import { listenOnLoopback, percentile, signIn } from './lib'
import { openPacer } from './paced'

process.env.WAYMARK_DB ??= 'waymark_bench_test'
process.env.NODE_ENV ??= 'test'
process.env.WAYMARK_REDIS_PREFIX ??= 'waymark-bench'
process.env.LOG_LEVEL ??= 'error'

const { values: args } = parseArgs({
  options: {
    requests: { type: 'string', default: '4000' },
    warmup: { type: 'string', default: '500' },
    paced: { type: 'string', default: '2000' },
    connections: { type: 'string', default: '32' },
    profile: { type: 'string' },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/scan.ts [--requests N] [--warmup N] [--paced N] [--connections N]
                                   [--profile file]

Resets its own database (WAYMARK_DB, default waymark_bench_test) and releases lots of a two-step
recipe, one unit per scan. Then, for a baseline (a bare Express route doing one INSERT through
pg), GET /api/auth/me and POST /api/step-runs, each over loopback with autocannon:
  warm-up     --warmup requests, not counted (lets V8 compile the hot paths);
  saturation  --requests requests on --connections connections, each sending its next request
              as soon as the answer comes: the throughput. Its latency is mostly queueing, since
              with C connections the mean latency is C / throughput;
  paced       --paced requests due evenly at the throughput target (half the baseline's), over at
              most --connections sockets, each timed from when it was due: the latency a
              station sees at that load (paced.ts says why autocannon's rate option cannot).
--profile writes a V8 CPU profile of the scan's saturation phase (open it in Chromium's DevTools).`)
  process.exit(0)
}
const REQUESTS = Number(args.requests)
const WARMUP = Number(args.warmup)
const PACED = Number(args.paced)
const CONNECTIONS = Number(args.connections)

const { migrator, ownerConnection, resetTestSchema } = await import('../../server/db/migrator')
const { env } = await import('../../server/env')
const owner = ownerConnection()
await resetTestSchema(owner)
await migrator(owner).up()
await owner.query(
  'CREATE TABLE bench_baseline (id uuid PRIMARY KEY, serial text NOT NULL, at timestamptz NOT NULL)',
)
await owner.close()

const { loadDemo } = await import('../../server/db/seed/demo')
const { buildApp } = await import('../../server/app')
const { seedBenchLot } = await import('./scanSeed')
await loadDemo({ onlyIfEmpty: false })
const serials = await seedBenchLot(WARMUP + REQUESTS + PACED)

interface Result {
  non2xx: number
  times: number[]
  /** Wall-clock seconds from the first request to the last answer. */
  seconds: number
  /** CPU seconds per 1000 requests: this process (server and load generator) and PostgreSQL. */
  cpu: { node: number; postgres: number }
}

/**
 * CPU seconds used so far by PostgreSQL (user + system, from /proc): every live server process,
 * plus what the postmaster's ended children used, so a pool connection closed mid-run still counts.
 */
function postgresCpuSeconds(): number {
  let ticks = 0
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    try {
      const stat = readFileSync(`/proc/${pid}/stat`, 'utf8')
      const close = stat.lastIndexOf(')')
      if (!stat.slice(stat.indexOf('(') + 1, close).startsWith('postgres')) continue
      const fields = stat.slice(close + 2).split(' ')
      // utime, stime, and cutime, cstime (the ended children's, nonzero for the postmaster)
      ticks += Number(fields[11]) + Number(fields[12]) + Number(fields[13]) + Number(fields[14])
    } catch {
      // the process ended while we read
    }
  }
  return ticks / 100
}
interface Load {
  amount: number
  /** Requests per second, due evenly (see paced.ts); absent: as fast as the answers come. */
  rate?: number
}

/** The CPU this process and PostgreSQL use while `go` runs, per 1000 of its requests. */
async function withCpu(go: () => Promise<Omit<Result, 'cpu'>>): Promise<Result> {
  const cpu0 = process.cpuUsage()
  const pg0 = postgresCpuSeconds()
  const out = await go()
  const used = process.cpuUsage(cpu0)
  const per = 1000 / Math.max(1, out.times.length)
  return {
    ...out,
    cpu: {
      node: ((used.user + used.system) / 1e6) * per,
      postgres: (postgresCpuSeconds() - pg0) * per,
    },
  }
}

/** Closed loop: each of the connections sends its next request as soon as it is answered. */
function saturate(
  url: string,
  bodies: (() => string) | null,
  headers: Record<string, string>,
  amount: number,
): Promise<Omit<Result, 'cpu'>> {
  const times: number[] = []
  const t0 = performance.now()
  let lastAt = t0
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url,
        connections: CONNECTIONS,
        amount,
        method: bodies ? 'POST' : 'GET',
        headers: { 'content-type': 'application/json', ...headers },
        requests: bodies ? [{ setupRequest: (req) => ({ ...req, body: bodies() }) }] : undefined,
      },
      (err, result) =>
        err
          ? reject(err)
          : // To the last answer: autocannon reports its end on its own one-second tick.
            resolve({ non2xx: result.non2xx, times, seconds: (lastAt - t0) / 1000 }),
    )
    // Every response's time, so p95 is computed exactly rather than read off a histogram.
    instance.on('response', (_client, _status, _bytes, responseTime) => {
      times.push(responseTime)
      lastAt = performance.now()
    })
    instance.on('error', reject)
  })
}

async function run(
  url: string,
  bodies: (() => string) | null,
  headers: Record<string, string>,
  load: Load,
): Promise<Result> {
  if (!load.rate) return withCpu(() => saturate(url, bodies, headers, load.amount))
  const pacer = await openPacer(
    {
      url,
      method: bodies ? 'POST' : 'GET',
      headers,
      bodies: bodies ? Array.from({ length: load.amount }, bodies) : null,
    },
    load.rate,
    load.amount,
    CONNECTIONS,
  )
  return withCpu(() => pacer.run())
}

/** A warm-up run (not counted), then the measured one. */
async function measure(
  url: string,
  bodies: (() => string) | null,
  headers: Record<string, string>,
  load: Load,
): Promise<Result> {
  if (WARMUP > 0) await run(url, bodies, headers, { amount: WARMUP })
  return run(url, bodies, headers, load)
}

// The baseline: the least any Express + PostgreSQL write can cost on this machine.
const pool = new pg.Pool({ connectionString: env.databaseUrl, max: 10 })
const bare = express().use(express.json())
bare.post('/insert', async (req, res) => {
  await pool.query('INSERT INTO bench_baseline (id, serial, at) VALUES ($1, $2, now())', [
    randomUUID(),
    (req.body as { serial: string }).serial,
  ])
  res.status(201).json({ ok: true })
})
const { server: bareServer, base: bareBase } = await listenOnLoopback(bare)
const bareUrl = `${bareBase}/insert`
const bareBody = () => JSON.stringify({ serial: 'X' })
const baseline = await measure(bareUrl, bareBody, {}, { amount: REQUESTS })
const perSecond = (r: Result) => r.times.length / r.seconds
const pacedRate = Math.round(perSecond(baseline) / 2)
// --paced 0 skips the paced runs.
const paced = (go: () => Promise<Result>) => (PACED > 0 ? go() : Promise.resolve(null))
const baselinePaced = await paced(() =>
  run(bareUrl, bareBody, {}, { amount: PACED, rate: pacedRate }),
)

const { server, base } = await listenOnLoopback(buildApp())
const { cookie, token } = await signIn(base, 'operator@ferncastle.example')
// What every signed-in request costs before any route work: session, user, CSRF, logging.
const signedIn = await measure(`${base}/api/auth/me`, null, { cookie }, { amount: REQUESTS })

// Each scan takes the next queued unit, so no request is refused for a unit already moved on.
let next = 0
const scanUrl = `${base}/api/step-runs`
const scanBody = () =>
  JSON.stringify({
    clientEventId: randomUUID(),
    serial: serials[next++],
    stationCode: 'WND-1',
    values: { turns: 92, l_sec: 25.4 },
  })
const scanHeaders = { cookie, 'x-csrf-token': token }
if (WARMUP > 0) await run(scanUrl, scanBody, scanHeaders, { amount: WARMUP })
const profiler = args.profile ? new inspector.Session() : null
if (profiler) {
  profiler.connect()
  await profiler.post('Profiler.enable')
  await profiler.post('Profiler.start')
}
console.error(`scan saturation: started (pid ${process.pid})`)
const scan = await run(scanUrl, scanBody, scanHeaders, { amount: REQUESTS })
if (profiler) {
  const { profile } = await profiler.post('Profiler.stop')
  writeFileSync(args.profile!, JSON.stringify(profile))
  profiler.disconnect()
}
const scanPaced = await paced(() =>
  run(scanUrl, scanBody, scanHeaders, { amount: PACED, rate: pacedRate }),
)

const p95 = (r: Result) =>
  percentile(
    [...r.times].sort((a, b) => a - b),
    95,
  )
const line = (name: string, r: Result) => {
  const t = [...r.times].sort((a, b) => a - b)
  const ms = (p: number) => `${percentile(t, p).toFixed(1)} ms`
  return [
    `  ${name.padEnd(20)} ${perSecond(r).toFixed(0).padStart(5)} req/s`,
    `p50 ${ms(50)}  p95 ${ms(95)}  p99 ${ms(99)}  non-2xx ${r.non2xx}`,
    `CPU per 1000: node ${r.cpu.node.toFixed(2)} s, postgres ${r.cpu.postgres.toFixed(2)} s`,
  ].join('   ')
}
const share = (100 * perSecond(scan)) / perSecond(baseline)
console.log(`\nsaturation: ${REQUESTS} requests, ${CONNECTIONS} connections, loopback`)
console.log(line('baseline (1 INSERT)', baseline))
console.log(line('GET /api/auth/me', signedIn))
console.log(line('POST /api/step-runs', scan))
if (baselinePaced && scanPaced) {
  console.log(
    `paced: ${PACED} requests due evenly at ${pacedRate} req/s (half the baseline's throughput)`,
  )
  console.log(line('baseline (1 INSERT)', baselinePaced))
  console.log(line('POST /api/step-runs', scanPaced))
}
console.log(
  `throughput: ${share.toFixed(0)} % of the baseline (target ≥ 50 %)` +
    (scanPaced ? `; p95 at the paced rate: ${p95(scanPaced).toFixed(1)} ms (target ≤ 25 ms)` : ''),
)
bareServer.close()
server.close()
await pool.end()
process.exit(0)
