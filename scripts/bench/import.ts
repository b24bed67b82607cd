// Benchmark of the bench-data import: `npx tsx scripts/bench/import.ts [--units 2000]`.
// Adds one lot to WAYMARK_DB (it does not reset it; use a test lane's database).
import { randomUUID } from 'node:crypto'
import { performance } from 'node:perf_hooks'
import { parseArgs } from 'node:util'

process.env.NODE_ENV ??= 'test'
process.env.LOG_LEVEL ??= 'error'

const { values: args } = parseArgs({
  options: { units: { type: 'string', default: '1000' }, help: { type: 'boolean' } },
})
if (args.help || !process.env.WAYMARK_DB) {
  console.log(`Usage: WAYMARK_DB=waymark_laneN_test WAYMARK_REDIS_PREFIX=… S3_BUCKET=… \\
  npx tsx scripts/bench/import.ts [--units N]

Adds a released lot of 2N units (at most 1000 each half: the lot size limit) of a small winding
recipe under a new product code to WAYMARK_DB (no reset), then
times: parsing a 20 MB CSV; upload, dry run and import job of an N-row file for the first lot;
and, as the baseline, N direct recordStepRun() calls for the other half of the lot (what the import job
does per row, without its bookkeeping).`)
  process.exit(args.help ? 0 : 1)
}
const UNITS = Number(args.units)

const { parseBenchCsv } = await import('../../server/services/imports')
const { closeDb, db, User } = await import('../../server/models')
db() // initialises the models
const imports = await import('../../server/services/imports')
const { recordStepRun } = await import('../../server/services/floor')
const { seedBenchLot } = await import('./scanSeed')

const ms = (t0: number) => performance.now() - t0
const line = (what: string, millis: number, rows: number) =>
  console.log(
    `${what.padEnd(44)} ${millis.toFixed(0).padStart(7)} ms  ${((rows / millis) * 1000).toFixed(0).padStart(7)} rows/s`,
  )

// 1. Parsing alone: a 20 MB file of the shape racks write.
const header = 'Serial,Tested at,Operator,Turns,L (mH)\n'
const sample = 'BN01-2649-00001X,2026-12-02 08:00:00,jmarsh,92,24.31\n'
const bigRows = Math.floor((20 * 1024 * 1024 - header.length) / sample.length)
const big = header + sample.repeat(bigRows)
let t0 = performance.now()
const parsed = parseBenchCsv(big)
line(`parse 20 MB (${parsed.rows.length} rows)`, ms(t0), parsed.rows.length)

// 2. One file through upload, dry run and the job.
const lead = (await User.findOne({ where: { role: 'lead' } }))!
const actor = { id: lead.id, email: lead.email }
// One lot of a new product: half imported, half the baseline.
const code = `BI${Math.floor(Math.random() * 1296)
  .toString(36)
  .toUpperCase()
  .padStart(2, '0')}`
const serials = await seedBenchLot(2 * UNITS, code)
const serialsA = serials.slice(0, UNITS)
const serialsB = serials.slice(UNITS)
const csv = Buffer.from(
  header +
    serialsA
      .map((s, i) => `${s},2026-12-02 08:00:00,jmarsh,92,${(24 + (i % 7) / 10).toFixed(2)}`)
      .join('\n'),
)
t0 = performance.now()
const uploaded = await imports.uploadBenchFile(
  { buffer: csv, originalname: 'bench.csv' },
  'WND-1',
  actor,
)
line(`upload (${(csv.length / 1024).toFixed(0)} kB)`, ms(t0), UNITS)
await imports.saveImportMapping(
  'WND-1',
  {
    serialColumn: 'Serial',
    timeColumn: 'Tested at',
    operatorColumn: 'Operator',
    checkColumns: { turns: 'Turns', l_sec: 'L (mH)' },
  },
  actor,
)
t0 = performance.now()
// The request and then its job, run here rather than by a worker.
await imports.requestDryRun(uploaded.id, actor)
await imports.checkImport(uploaded.id)
const checked = await imports.getImport(uploaded.id)
line(`dry run (${checked.counts.ready} ready)`, ms(t0), UNITS)
await imports.requestImportRun(uploaded.id, { defectCodeId: null }, actor)
t0 = performance.now()
await imports.processImport(uploaded.id)
line('import job', ms(t0), UNITS)
const done = await imports.getImport(uploaded.id)
console.log(
  `  recorded ${done.counts.recorded}, repeats ${done.counts.skipped}, refused ${done.counts.refused}`,
)

// 3. Baseline: the same rows straight through recordStepRun().
t0 = performance.now()
for (const serial of serialsB)
  await recordStepRun(
    {
      clientEventId: randomUUID(),
      serial,
      stationCode: 'WND-1',
      values: { turns: 92, l_sec: 24.3 },
      consumptions: [],
      defectCodeId: null,
      note: '',
      countersign: null,
    },
    actor,
  )
line('baseline: recordStepRun() directly', ms(t0), UNITS)
await closeDb()
process.exit(0)
