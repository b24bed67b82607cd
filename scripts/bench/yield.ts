// Benchmark of the Yield board's endpoints: `npx tsx scripts/bench/yield.ts [--lots 200]
// [--units-per-lot 500] [--requests 40]`. Run it after `npm test` has started the services.
import http from 'node:http'
import { performance } from 'node:perf_hooks'
import { parseArgs } from 'node:util'
import pg from 'pg'
import { benchEnvironment, migrateBenchDatabase, listenOnLoopback, percentile, signIn } from './lib'

benchEnvironment({ WAYMARK_WORKERS: 'off' })

const { values: args } = parseArgs({
  options: {
    lots: { type: 'string', default: '200' },
    'units-per-lot': { type: 'string', default: '500' },
    days: { type: 'string', default: '365' },
    requests: { type: 'string', default: '40' },
    // Keeps the seeded database of an earlier run: migrates it (new indexes) and measures again.
    keep: { type: 'boolean', default: false },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/yield.ts [--lots N] [--units-per-lot N] [--days N] [--requests N]

Resets its own database (WAYMARK_DB, default waymark_bench_test), seeds N lots of units with
their step runs and measurements in bulk (200 × 500 = 100 000 units, about 1 000 000 step runs),
then calls the Yield board's endpoints through the real Express app over loopback, one request at
a time, and runs the same SQL straight through pg. Prints p50/p95 of both.`)
  process.exit(0)
}
const REQUESTS = Number(args.requests)

await migrateBenchDatabase({ keep: args.keep })
const { env } = await import('../../server/env')

const { loadDemo } = await import('../../server/seed/demo')
const { buildApp } = await import('../../server/main/app')
const { db } = await import('../../server/models')
const { seedYieldBench, seededBench } = await import('./yieldSeed')
const seedStart = performance.now()
if (!args.keep) await loadDemo({ onlyIfEmpty: false })
const seed = args.keep
  ? await seededBench(Number(args.lots))
  : await seedYieldBench({
      lots: Number(args.lots),
      unitsPerLot: Number(args['units-per-lot']),
      days: Number(args.days),
    })
// As autovacuum would leave a settled database: statistics and the visibility map (which
// index-only scans rely on) up to date. Only the owner role may vacuum.
const { ownerConnection } = await import('../../server/db/migrator')
const vacuum = ownerConnection()
for (const table of ['lots', 'units', 'step_runs', 'measurements'])
  await vacuum.query(`VACUUM (ANALYZE) ${table}`)
await vacuum.close()
console.log(
  `${args.keep ? 'kept' : 'seeded'} ${seed.lots} lots, ${seed.units} units, ${seed.stepRuns} step runs, ${seed.measurements} measurements in ${((performance.now() - seedStart) / 1000).toFixed(0)} s`,
)

const { server, base } = await listenOnLoopback(buildApp())
const { cookie } = await signIn(base, 'lead@ferncastle.example')

// The SQL each endpoint runs, captured from Sequelize's log during one call (with the
// replacements already inlined), so the raw run below executes exactly the same statements.
const captured: string[] = []
;(db() as unknown as { options: { logging: (sql: string) => void } }).options.logging = (sql) => {
  captured.push(sql.replace(/^Executing \([^)]*\): /, ''))
}
// Everything the endpoint itself runs; the session and user look-ups of the guard are left out.
const isYieldSql = (sql: string) => !/\b(sessions|users)\b/.test(sql)

// node:http on one kept-alive connection, as a browser holds one: fetch() adds about 2 ms of its
// own per request, which would be counted against the API.
const agent = new http.Agent({ keepAlive: true, maxSockets: 1 })
function call(path: string): Promise<number> {
  const t = performance.now()
  return new Promise((resolve, reject) => {
    http
      .get(`${base}${path}`, { agent, headers: { cookie } }, (res) => {
        res.on('data', () => undefined)
        res.on('end', () =>
          res.statusCode === 200
            ? resolve(performance.now() - t)
            : reject(new Error(`${path}: ${res.statusCode}`)),
        )
      })
      .on('error', reject)
  })
}

const pool = new pg.Pool({ connectionString: env.databaseUrl, max: 4 })
async function raw(statements: readonly string[]): Promise<number> {
  const t = performance.now()
  for (const sql of statements) await pool.query(sql)
  return performance.now() - t
}

async function timed(run: () => Promise<number>): Promise<{ p50: number; p95: number }> {
  for (let i = 0; i < 3; i++) await run() // warm caches and plans
  const times: number[] = []
  for (let i = 0; i < REQUESTS; i++) times.push(await run())
  times.sort((a, b) => a - b)
  return { p50: percentile(times, 50), p95: percentile(times, 95) }
}

const year = new Date(Date.now() - 366 * 86_400_000).toISOString().slice(0, 10)
const endpoints: [string, string][] = [
  ['summary, last 30 days', `/api/yield/summary?from=${seed.from}&to=${seed.to}`],
  ['summary, whole year', `/api/yield/summary?from=${year}&to=${seed.to}`],
  ['one lot', `/api/yield/lots/${seed.sampleLotId}`],
  ['lots export CSV, 30 d', `/api/exports/lots?format=csv&from=${seed.from}&to=${seed.to}`],
  ['lots export XLSX, 30 d', `/api/exports/lots?format=xlsx&from=${seed.from}&to=${seed.to}`],
]
const rows: string[] = []
for (const [name, path] of endpoints) {
  // Captured on the second call, once the first has kept what it keeps (lot_step_yields), so
  // the raw run repeats what every later call runs.
  await call(path)
  captured.length = 0
  await call(path)
  const statements = captured.filter(isYieldSql)
  const api = await timed(() => call(path))
  const sql = await timed(() => raw(statements))
  const ratio = api.p50 / sql.p50
  rows.push(
    `${name.padEnd(24)} API p50 ${api.p50.toFixed(1).padStart(7)} ms  p95 ${api.p95.toFixed(1).padStart(7)} ms   SQL (${statements.length} statements) p50 ${sql.p50.toFixed(1).padStart(7)} ms  p95 ${sql.p95.toFixed(1).padStart(7)} ms   API/SQL ${ratio.toFixed(2)}`,
  )
  console.log(rows.at(-1))
}
console.log(
  `\n${REQUESTS} sequential requests each after 3 warm-up calls, loopback; SQL run one statement after another through pg`,
)
console.log('targets: API p95 ≤ 150 ms and API ≤ 2 × the raw SQL')
agent.destroy()
server.close()
await pool.end()
process.exit(0)
