// Benchmark of the scan route: `npx tsx scripts/bench/scan.ts [--units 2000] [--connections 32]`.
// Run it after `npm test` has prepared the services (it uses WAYMARK_DB, default waymark_bench).
import { randomUUID } from 'node:crypto'
import { writeFileSync } from 'node:fs'
import inspector from 'node:inspector/promises'
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { parseArgs } from 'node:util'
import autocannon from 'autocannon'
import express from 'express'
import pg from 'pg'

process.env.WAYMARK_DB ??= 'waymark_bench_test'
process.env.NODE_ENV ??= 'test'
process.env.WAYMARK_REDIS_PREFIX ??= 'waymark-bench'
process.env.LOG_LEVEL ??= 'error'

const { values: args } = parseArgs({
  options: {
    units: { type: 'string', default: '2000' },
    connections: { type: 'string', default: '32' },
    profile: { type: 'string' },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/scan.ts [--units N] [--connections N] [--profile file]

Resets its own database (WAYMARK_DB, default waymark_bench_test), releases one lot of N units of a
one-step recipe, then drives POST /api/step-runs with autocannon over loopback, next to a
baseline: a bare Express route doing one INSERT through pg. Prints p50/p95/p99 and throughput.
--profile writes a V8 CPU profile of the scan phase alone (open it in Chromium's DevTools).`)
  process.exit(0)
}
const UNITS = Number(args.units)
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
const serials = await seedBenchLot(UNITS)

interface Result {
  result: autocannon.Result
  times: number[]
}
function run(
  url: string,
  bodies: (() => string) | null,
  headers: Record<string, string>,
): Promise<Result> {
  const times: number[] = []
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url,
        connections: CONNECTIONS,
        amount: UNITS,
        method: bodies ? 'POST' : 'GET',
        headers: { 'content-type': 'application/json', ...headers },
        requests: bodies ? [{ setupRequest: (req) => ({ ...req, body: bodies() }) }] : undefined,
      },
      (err, result) => (err ? reject(err) : resolve({ result, times })),
    )
    // Every response's time, so p95 is computed exactly rather than read off a histogram.
    instance.on('response', (_client, _status, _bytes, responseTime) => times.push(responseTime))
    instance.on('error', reject)
  })
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
function listen(handler: express.Express): Promise<Server> {
  return new Promise((resolve) => {
    const s = handler.listen(0, '127.0.0.1', () => resolve(s))
  })
}
const bareServer = await listen(bare)
const barePort = (bareServer.address() as AddressInfo).port
const baseline = await run(
  `http://127.0.0.1:${barePort}/insert`,
  () => JSON.stringify({ serial: 'X' }),
  {},
)

const app = buildApp()
const server = await listen(app)
const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`
const csrf1 = await fetch(`${base}/api/auth/csrf`)
let cookie = csrf1.headers.get('set-cookie')!.split(';')[0]!
const login = await fetch(`${base}/api/auth/login`, {
  method: 'POST',
  headers: {
    'content-type': 'application/json',
    cookie,
    'x-csrf-token': ((await csrf1.json()) as { csrfToken: string }).csrfToken,
  },
  body: JSON.stringify({ email: 'operator@ferncastle.example', password: 'waymark-demo' }),
})
cookie = login.headers.get('set-cookie')!.split(';')[0]!
const token = (
  (await (await fetch(`${base}/api/auth/csrf`, { headers: { cookie } })).json()) as {
    csrfToken: string
  }
).csrfToken
// What every signed-in request costs before any route work: session, user, CSRF, logging.
const signedIn = await run(`${base}/api/auth/me`, null, { cookie })

const profiler = args.profile ? new inspector.Session() : null
if (profiler) {
  profiler.connect()
  await profiler.post('Profiler.enable')
  await profiler.post('Profiler.start')
}
let next = 0
const scan = await run(
  `${base}/api/step-runs`,
  () =>
    JSON.stringify({
      clientEventId: randomUUID(),
      serial: serials[next++ % serials.length],
      stationCode: 'WND-1',
      values: { turns: 92, l_sec: 25.4 },
    }),
  { cookie, 'x-csrf-token': token },
)

if (profiler) {
  const { profile } = await profiler.post('Profiler.stop')
  writeFileSync(args.profile!, JSON.stringify(profile))
  profiler.disconnect()
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? NaN
}
const perSecond = (r: Result) => r.times.length / (r.result.duration || 1)
const line = (name: string, r: Result) => {
  const t = [...r.times].sort((a, b) => a - b)
  const ms = (p: number) => `${percentile(t, p).toFixed(1)} ms`
  return `${name.padEnd(22)} ${perSecond(r).toFixed(0).padStart(6)} req/s   p50 ${ms(50)}   p95 ${ms(95)}   p99 ${ms(99)}   non-2xx ${r.result.non2xx}`
}
console.log(`\n${UNITS} requests, ${CONNECTIONS} connections, loopback`)
console.log(line('baseline (1 INSERT)', baseline))
console.log(line('GET /api/auth/me', signedIn))
console.log(line('POST /api/step-runs', scan))
console.log(
  `throughput: ${((100 * perSecond(scan)) / perSecond(baseline)).toFixed(0)} % of the baseline`,
)
console.log('targets: p95 ≤ 25 ms, throughput ≥ 50 % of the baseline')
bareServer.close()
server.close()
await pool.end()
process.exit(0)
