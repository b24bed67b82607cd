// Benchmark of the scan route: `npx tsx scripts/bench/scan.ts [--units 2000] [--connections 32]`.
// Run it after `npm test` has prepared the services (it uses WAYMARK_DB, default waymark_bench).
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
import inspector from 'node:inspector/promises'
import { availableParallelism } from 'node:os'
import { parseArgs } from 'node:util'
import autocannon from 'autocannon'
import express from 'express'
import pg from 'pg'
import { benchEnvironment, migrateBenchDatabase, listenOnLoopback, percentile, signIn } from './lib'
import { openPacer } from './paced'

benchEnvironment()

const { values: args } = parseArgs({
  options: {
    requests: { type: 'string', default: '4000' },
    rounds: { type: 'string', default: '4' },
    warmup: { type: 'string', default: '500' },
    paced: { type: 'string', default: '2000' },
    connections: { type: 'string', default: '32' },
    profile: { type: 'string' },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/scan.ts [--requests N] [--rounds N] [--warmup N] [--paced N]
                                   [--connections N] [--profile file]

Resets its own database (WAYMARK_DB, default waymark_bench_test) and releases lots of a two-step
recipe, one unit per scan. Then, for a baseline (a bare Express route doing one INSERT through
pg), GET /api/auth/me and POST /api/step-runs, each over loopback with autocannon:
  warm-up     --warmup requests, not counted (lets V8 compile the hot paths);
  saturation  --requests requests on --connections connections, each sending its next request
              as soon as the answer comes: the throughput. The three take turns in --rounds
              rounds, since the machine's speed drifts, and the scan's share of the baseline is
              the median of the rounds' shares. The latency is mostly queueing: with C
              connections the mean latency is C / throughput, and the CPU a request costs puts
              a floor under it, which each line prints;
  paced       --paced requests due evenly at the throughput target (half the baseline's), over at
              most --connections sockets, each timed from when it was due: the latency a
              station sees at that load (paced.ts says why autocannon's rate option cannot).
--profile writes a V8 CPU profile of one more scan round, not counted (open it in Chromium's
DevTools).`)
  process.exit(0)
}
const REQUESTS = Number(args.requests)
const ROUNDS = Math.max(1, Number(args.rounds))
const PER_ROUND = Math.ceil(REQUESTS / ROUNDS)
const WARMUP = Number(args.warmup)
const PACED = Number(args.paced)
const CONNECTIONS = Number(args.connections)

await migrateBenchDatabase({
  then: (owner) =>
    owner.query(
      'CREATE TABLE bench_baseline (id uuid PRIMARY KEY, serial text NOT NULL, at timestamptz NOT NULL)',
    ),
})
const { env } = await import('../../server/env')

const { loadDemo } = await import('../../server/seed/demo')
const { buildApp } = await import('../../server/main/app')
const { seedBenchLot } = await import('./scanSeed')
await loadDemo({ onlyIfEmpty: false })
// A unit per scan: the warm-up, the rounds, the profiled round and the paced run.
const serials = await seedBenchLot(
  WARMUP + PER_ROUND * ROUNDS + (args.profile ? PER_ROUND : 0) + PACED,
)

interface Result {
  non2xx: number
  times: number[]
  /** Wall-clock seconds from the first request to the last answer. */
  seconds: number
  /**
   * CPU seconds per 1000 requests: this process (server and load generator), its main thread
   * alone (where the servers run, and autocannon at saturation) and PostgreSQL.
   */
  cpu: { node: number; main: number; postgres: number }
}

/**
 * A /proc stat file read: the command name, and the CPU ticks (hundredths of a second) of the
 * process or thread itself and of its ended children, each user + system.
 */
function procStat(path: string): { name: string; own: number; children: number } {
  const stat = readFileSync(path, 'utf8')
  const close = stat.lastIndexOf(')')
  const fields = stat.slice(close + 2).split(' ')
  return {
    name: stat.slice(stat.indexOf('(') + 1, close),
    own: Number(fields[11]) + Number(fields[12]),
    children: Number(fields[13]) + Number(fields[14]),
  }
}

/**
 * CPU seconds used so far by PostgreSQL: every live server process, plus what the postmaster's
 * ended children used, so a pool connection closed mid-run still counts.
 */
function postgresCpuSeconds(): number {
  let ticks = 0
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    try {
      const stat = procStat(`/proc/${pid}/stat`)
      if (stat.name.startsWith('postgres')) ticks += stat.own + stat.children
    } catch {
      // the process ended while we read
    }
  }
  return ticks / 100
}

/** CPU seconds used so far by this process's main thread. */
const mainThreadCpuSeconds = () => procStat(`/proc/self/task/${process.pid}/stat`).own / 100

interface Load {
  amount: number
  /** Requests per second, due evenly (see paced.ts); absent: as fast as the answers come. */
  rate?: number
}

/** The CPU this process and PostgreSQL use while `go` runs, per 1000 of its requests. */
async function withCpu(go: () => Promise<Omit<Result, 'cpu'>>): Promise<Result> {
  const cpu0 = process.cpuUsage()
  const main0 = mainThreadCpuSeconds()
  const pg0 = postgresCpuSeconds()
  const out = await go()
  const used = process.cpuUsage(cpu0)
  const per = 1000 / Math.max(1, out.times.length)
  return {
    ...out,
    cpu: {
      node: ((used.user + used.system) / 1e6) * per,
      main: (mainThreadCpuSeconds() - main0) * per,
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

/** Runs of one target taken as one: their answers pooled, their time and CPU added up. */
function pooled(runs: readonly Result[]): Result {
  const n = (r: Result) => r.times.length
  const total = runs.reduce((sum, r) => sum + n(r), 0)
  const cpu = (k: keyof Result['cpu']) => runs.reduce((sum, r) => sum + r.cpu[k] * n(r), 0) / total
  return {
    times: runs.flatMap((r) => r.times),
    seconds: runs.reduce((sum, r) => sum + r.seconds, 0),
    non2xx: runs.reduce((sum, r) => sum + r.non2xx, 0),
    cpu: { node: cpu('node'), main: cpu('main'), postgres: cpu('postgres') },
  }
}
const perSecond = (r: Result) => r.times.length / r.seconds

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

const { server, base } = await listenOnLoopback(buildApp())
const { cookie, token } = await signIn(base, 'operator@ferncastle.example')
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
const signedInUrl = `${base}/api/auth/me`

// Warm-ups, not counted: they let V8 compile the hot paths.
if (WARMUP > 0) {
  await run(bareUrl, bareBody, {}, { amount: WARMUP })
  await run(signedInUrl, null, { cookie }, { amount: WARMUP })
  await run(scanUrl, scanBody, scanHeaders, { amount: WARMUP })
}

// The machine's speed drifts by half within minutes, so the three targets take turns in short
// rounds, and each round's scan is compared with the baseline of the same round.
const rounds: { baseline: Result; signedIn: Result; scan: Result }[] = []
console.error(`saturation: ${ROUNDS} rounds (pid ${process.pid})`)
for (let i = 0; i < ROUNDS; i++) {
  rounds.push({
    baseline: await run(bareUrl, bareBody, {}, { amount: PER_ROUND }),
    // What every signed-in request costs before any route work: session, user, CSRF, logging.
    signedIn: await run(signedInUrl, null, { cookie }, { amount: PER_ROUND }),
    scan: await run(scanUrl, scanBody, scanHeaders, { amount: PER_ROUND }),
  })
}
const baseline = pooled(rounds.map((r) => r.baseline))
const signedIn = pooled(rounds.map((r) => r.signedIn))
const scan = pooled(rounds.map((r) => r.scan))

if (args.profile) {
  // One more scan round, not counted, under the profiler.
  const profiler = new inspector.Session()
  profiler.connect()
  await profiler.post('Profiler.enable')
  await profiler.post('Profiler.start')
  await run(scanUrl, scanBody, scanHeaders, { amount: PER_ROUND })
  const { profile } = await profiler.post('Profiler.stop')
  writeFileSync(args.profile, JSON.stringify(profile))
  profiler.disconnect()
}

// --paced 0 skips the paced runs.
const pacedRate = Math.round(perSecond(baseline) / 2)
const paced = (go: () => Promise<Result>) => (PACED > 0 ? go() : Promise.resolve(null))
const baselinePaced = await paced(() =>
  run(bareUrl, bareBody, {}, { amount: PACED, rate: pacedRate }),
)
const scanPaced = await paced(() =>
  run(scanUrl, scanBody, scanHeaders, { amount: PACED, rate: pacedRate }),
)

const plural = (n: number, noun: string) => `${n} ${noun}${n === 1 ? '' : 's'}`
/** The middle value, or the mean of the two middle values of an even count. */
function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b)
  const mid = s.length / 2
  return Number.isInteger(mid) ? (s[mid - 1]! + s[mid]!) / 2 : s[Math.floor(mid)]!
}
const sorted = (r: Result) => [...r.times].sort((a, b) => a - b)
const p95 = (r: Result) => percentile(sorted(r), 95)
const mean = (r: Result) => r.times.reduce((a, b) => a + b, 0) / Math.max(1, r.times.length)
const CORES = availableParallelism()
/**
 * The least mean latency the CPU a run used allows C closed-loop connections, in ms. With no
 * pause between an answer and the next request, the mean latency is C / throughput (Little's
 * law). The throughput is at most cores / (CPU per request, counting this process, with its load
 * generator, and PostgreSQL), and at most 1 / (CPU per request of the main thread), which is one
 * core: so the mean is at least C times the larger of the two, however well the work spreads.
 * `cpu` is in seconds per 1000 requests, which is ms per request. It is an estimate, a few per
 * cent high: the CPU counted includes opening and closing the run's connections, and /proc
 * counts the main thread's in hundredths of a second.
 */
const cpuFloor = (r: Result) =>
  CONNECTIONS * Math.max((r.cpu.node + r.cpu.postgres) / CORES, r.cpu.main)
const line = (name: string, r: Result, isClosed: boolean) => {
  const t = sorted(r)
  const ms = (p: number) => `${percentile(t, p).toFixed(1)} ms`
  return [
    `  ${name.padEnd(20)} ${perSecond(r).toFixed(0).padStart(5)} req/s`,
    `p50 ${ms(50)}  p95 ${ms(95)}  p99 ${ms(99)}  mean ${mean(r).toFixed(1)} ms` +
      (isClosed ? ` (CPU floor ~${cpuFloor(r).toFixed(1)} ms)` : ''),
    `non-2xx ${r.non2xx}`,
    `CPU per 1000: node ${r.cpu.node.toFixed(2)} s (main thread ${r.cpu.main.toFixed(2)} s), ` +
      `postgres ${r.cpu.postgres.toFixed(2)} s`,
  ].join('   ')
}
const shares = rounds.map((r) => (100 * perSecond(r.scan)) / perSecond(r.baseline))
const share = median(shares)
console.log(
  `\nsaturation: ${plural(ROUNDS, 'round')} of ${PER_ROUND} requests each, ${plural(CONNECTIONS, 'connection')}, ` +
    `loopback, ${CORES} cores`,
)
console.log(line('baseline (1 INSERT)', baseline, true))
console.log(line('GET /api/auth/me', signedIn, true))
console.log(line('POST /api/step-runs', scan, true))
if (baselinePaced && scanPaced) {
  console.log(
    `paced: ${PACED} requests due evenly at ${pacedRate} req/s (half the baseline's throughput)`,
  )
  console.log(line('baseline (1 INSERT)', baselinePaced, false))
  console.log(line('POST /api/step-runs', scanPaced, false))
}
const roundLine = (r: (typeof rounds)[number], i: number) =>
  `${perSecond(r.baseline).toFixed(0)} / ${perSecond(r.scan).toFixed(0)} (${shares[i]!.toFixed(0)} %)`
console.log(`rounds, baseline / scan req/s: ${rounds.map(roundLine).join(', ')}`)
console.log(
  `throughput: ${share.toFixed(0)} % of the baseline, the median of the rounds (target ≥ 50 %)`,
)
console.log(
  `p95 at ${plural(CONNECTIONS, 'connection')}: ${p95(scan).toFixed(1)} ms, baseline ${p95(baseline).toFixed(1)} ms` +
    ` (target ≤ 25 ms)` +
    (scanPaced && baselinePaced
      ? `; at the paced rate: ${p95(scanPaced).toFixed(1)} ms, baseline ${p95(baselinePaced).toFixed(1)} ms`
      : ''),
)
bareServer.close()
server.close()
await pool.end()
process.exit(0)
