// Benchmark of Trace: `npx tsx scripts/bench/trace.ts [--lots 40] [--lot-size 500] [--samples 300]`.
// Run it after `npm test` has prepared the services (it uses WAYMARK_DB, default waymark_bench_test).
import { parseArgs } from 'node:util'
import pg from 'pg'
import { benchEnvironment, migrateBenchDatabase, listenOnLoopback, percentile, signIn } from './lib'

benchEnvironment()

const { values: args } = parseArgs({
  options: {
    lots: { type: 'string', default: '40' },
    'lot-size': { type: 'string', default: '500' },
    'per-lot': { type: 'string', default: '5000' },
    samples: { type: 'string', default: '300' },
    help: { type: 'boolean' },
  },
})
if (args.help) {
  console.log(`Usage: tsx scripts/bench/trace.ts [--lots N] [--lot-size N] [--per-lot N] [--samples N]

Resets its own database (WAYMARK_DB, default waymark_bench_test), loads the demo and then bulk-loads
lots × lot-size units with a full passing history (a step run per route step, every check measured,
every BOM line fitted from component lots of per-lot units each, shipments, documents). Then times,
one request at a time over loopback, GET /api/trace/units/:serial for random serials and
GET /api/trace/component-lots/:code for a lot fitted in per-lot units, each beside the same SQL run
straight through pg. Then GET /api/search?q= for a mix of what people type in the top bar (whole
serials, serials without or with a wrong check character, serial fragments, lot numbers, component
lot codes, customers, products, shipments), beside the same searches called in the process without
HTTP. Prints p50/p95/p99.`)
  process.exit(0)
}
const LOTS = Number(args.lots)
const LOT_SIZE = Number(args['lot-size'])
const PER_LOT = Number(args['per-lot'])
const SAMPLES = Number(args.samples)

await migrateBenchDatabase()
const { env } = await import('../../server/env')

const { loadDemo } = await import('../../server/seed/demo')
const { buildApp } = await import('../../server/main/app')
const { seedTraceHistory } = await import('./traceSeed')
const { RECALL_SCOPE_SQL, UNIT_TRACE_SQL } = await import('../../server/services/trace')
const { searchRecords } = await import('../../server/services/search')
await loadDemo({ onlyIfEmpty: false })
const seedClient = new pg.Client({ connectionString: env.ownerDatabaseUrl })
await seedClient.connect()
const started = Date.now()
const data = await seedTraceHistory(seedClient, { lots: LOTS, perLot: PER_LOT, lotSize: LOT_SIZE })
/** What people type in the top bar's search box, one of each kind per row of the mix. */
const searchMix: string[] = []
{
  const names = async (sql: string) => (await seedClient.query(sql)).rows.map((r) => String(r.v))
  const lots = await names('SELECT number AS v FROM lots ORDER BY number')
  const codes = await names('SELECT internal_code AS v FROM component_lots ORDER BY internal_code')
  const supplier = await names('SELECT supplier_lot_code AS v FROM component_lots ORDER BY 1')
  const customers = await names('SELECT name AS v FROM customers ORDER BY name')
  const products = await names('SELECT code AS v FROM products ORDER BY code')
  const shipments = await names('SELECT number AS v FROM shipments ORDER BY number')
  const at = <T>(list: T[], i: number) => list[(i * 7919) % list.length]!
  for (let i = 0; i < 40; i++) {
    const serial = at(data.serials, i)
    const wrong = serial.slice(0, -1) + (serial.endsWith('Z') ? 'Y' : 'Z')
    searchMix.push(
      serial,
      serial.slice(0, -1),
      wrong,
      serial.slice(-6, -1),
      at(lots, i),
      at(codes, i),
      at(supplier, i).slice(0, 6),
      at(customers, i).split(' ')[0]!,
      at(products, i),
      at(shipments, i),
    )
  }
}
const [counts] = (
  await seedClient.query(
    `SELECT (SELECT count(*) FROM units) AS units, (SELECT count(*) FROM step_runs) AS step_runs,
       (SELECT count(*) FROM measurements) AS measurements,
       (SELECT count(*) FROM consumptions) AS consumptions`,
  )
).rows as Record<string, string>[]
await seedClient.end()
console.log(
  `seeded in ${((Date.now() - started) / 1000).toFixed(1)} s: ${counts!.units} units, ` +
    `${counts!.step_runs} step runs, ${counts!.measurements} measurements, ${counts!.consumptions} consumptions`,
)

const { server, base } = await listenOnLoopback(buildApp())
const { cookie } = await signIn(base, 'service@ferncastle.example')

const pool = new pg.Pool({ connectionString: env.databaseUrl, max: 4 })

/** Times `count` sequential calls of `fn(i)` after `warm` unmeasured ones, in milliseconds. */
async function time(count: number, warm: number, fn: (i: number) => Promise<void>) {
  for (let i = 0; i < warm; i++) await fn(i)
  const times: number[] = []
  for (let i = 0; i < count; i++) {
    const t0 = performance.now()
    await fn(i + warm)
    times.push(performance.now() - t0)
  }
  return times.sort((a, b) => a - b)
}
const pick = (i: number) => data.serials[(i * 7919) % data.serials.length]!
async function get(path: string) {
  const res = await fetch(`${base}${path}`, { headers: { cookie } })
  if (!res.ok) throw new Error(`${path}: ${res.status}`)
  await res.arrayBuffer()
}

const apiTrace = await time(SAMPLES, 20, (i) => get(`/api/trace/units/${pick(i)}`))
const sqlTrace = await time(SAMPLES, 20, async (i) => {
  await pool.query(UNIT_TRACE_SQL, [pick(i)])
})
const RECALLS = Math.max(20, Math.round(SAMPLES / 10))
const apiRecall = await time(RECALLS, 3, () => get(`/api/trace/component-lots/${data.hotLotCode}`))
const sqlRecall = await time(RECALLS, 3, async () => {
  await pool.query(RECALL_SCOPE_SQL, [data.hotLotCode])
})
const scope = (await (
  await fetch(`${base}/api/trace/component-lots/${data.hotLotCode}`, { headers: { cookie } })
).json()) as { counts: { total: number } }

const searchUrl = (i: number) =>
  `/api/search?q=${encodeURIComponent(searchMix[i % searchMix.length]!)}`
const apiSearch = await time(SAMPLES, 20, (i) => get(searchUrl(i)))
const inProcessSearch = await time(SAMPLES, 20, async (i) => {
  await searchRecords(searchMix[i % searchMix.length]!, 'service')
})

const line = (name: string, t: number[]) => {
  const ms = (p: number) => `${percentile(t, p).toFixed(1)} ms`.padStart(9)
  return `${name.padEnd(44)} n=${String(t.length).padEnd(4)} p50 ${ms(50)}   p95 ${ms(95)}   p99 ${ms(99)}`
}
console.log(`\none request at a time, loopback; ${data.serials.length} bench units`)
console.log(line('GET /api/trace/units/:serial', apiTrace))
console.log(line('  same SQL through pg', sqlTrace))
console.log(line(`GET /api/trace/component-lots/:code (${scope.counts.total} units)`, apiRecall))
console.log(line('  same SQL through pg', sqlRecall))
console.log(line(`GET /api/search?q= (mix of ${searchMix.length} texts)`, apiSearch))
console.log(line('  same searches in process, no HTTP', inProcessSearch))
console.log(
  'targets: trace p95 ≤ 30 ms, recall scope of a lot in 5000 units p95 ≤ 200 ms, search p95 ≤ 50 ms',
)
server.close()
await pool.end()
process.exit(0)
