import type { Transaction } from 'sequelize'
import { SEED_ACTOR } from '../../server/seed/demo'
import { createCheck } from '../../server/services/recipes'
import { createProduct } from '../../server/services/recipes'
import { releaseRevision } from '../../server/services/recipes'
import { createStep } from '../../server/services/recipes'
import type { StationKind } from '../../shared/stations'
import type { Unit } from '../../shared/units'
import { REBUILD_YIELD_ROLLUPS } from '../../server/db/yieldRollups'
import { execute, select, withTransaction } from '../../server/db/sql'

// Seed of the yield benchmark: two released bench products with ten-step routes, then lots,
// units, step runs and their measurements written in bulk by set-based INSERT … SELECT over
// generate_series (one statement per table), not row by row through the app.

const ROUTE: { name: string; kind: StationKind; checks: [string, Unit, number, number][] }[] = [
  {
    name: 'Wind primary',
    kind: 'winding',
    checks: [
      ['l_pri', 'µH', 81, 135],
      ['turns_pri', 'turns', 6, 6],
    ],
  },
  {
    name: 'Wind secondary',
    kind: 'winding',
    checks: [
      ['l_sec', 'mH', 19, 32],
      ['turns_sec', 'turns', 92, 92],
    ],
  },
  {
    name: 'Ratio test',
    kind: 'winding',
    checks: [
      ['v_pri', 'V', 9.9, 10.1],
      ['v_sec', 'V', 140, 167],
    ],
  },
  {
    name: 'Soldering',
    kind: 'soldering',
    checks: [
      ['r_sec', 'Ω', 0.8, 1.4],
      ['r_pri', 'mΩ', 5, 20],
    ],
  },
  {
    name: 'Visual',
    kind: 'inspection',
    checks: [
      ['gap_mm', '%', 0, 5],
      ['tilt', '%', 0, 3],
    ],
  },
  {
    name: 'Hipot',
    kind: 'hipot',
    checks: [
      ['hipot_v', 'V', 1500, 1600],
      ['leak_ma', 'mA', 0, 5],
    ],
  },
  {
    name: 'Burn-in',
    kind: 'load_test',
    checks: [
      ['case_c', '°C', 20, 85],
      ['burn_s', 's', 3600, 3700],
    ],
  },
  {
    name: 'Load test',
    kind: 'load_test',
    checks: [
      ['vout', 'V', 345, 355],
      ['iout', 'A', 0.8, 0.9],
    ],
  },
  {
    name: 'Final inspection',
    kind: 'inspection',
    checks: [
      ['label_ok', '%', 100, 100],
      ['marks', '%', 0, 1],
    ],
  },
  {
    name: 'Packing',
    kind: 'packing',
    checks: [
      ['weight', '%', 0, 100],
      ['count', 'turns', 1, 1],
    ],
  },
]

async function benchRevision(code: string): Promise<string> {
  const product = await createProduct(
    { code, name: `Bench converter ${code}`, description: 'made by scripts/bench/yield.ts' },
    SEED_ACTOR,
  )
  const revId = product.revisions[0]!.id
  for (const s of ROUTE) {
    const step = await createStep(
      revId,
      {
        name: s.name,
        stationKind: s.kind,
        instructions: '',
        safetyNote:
          s.kind === 'hipot' || s.kind === 'load_test'
            ? 'High voltage: follow the applicable safety standard.'
            : '',
        requiresSignoff: false,
      },
      SEED_ACTOR,
    )
    for (const [key, unit, lower, upper] of s.checks)
      await createCheck(
        step.id,
        {
          key,
          label: key,
          kind: 'numeric',
          unit,
          lower,
          upper,
          nominal: null,
          decimals: 2,
          choices: null,
          derived: null,
          derivedInputs: null,
        },
        SEED_ACTOR,
      )
  }
  await releaseRevision(revId, SEED_ACTOR)
  return revId
}

export interface BenchSeed {
  lots: number
  units: number
  stepRuns: number
  measurements: number
  /** A lot of the middle of the range, for GET /api/yield/lots/:id. */
  sampleLotId: string
  from: string
  to: string
}

/**
 * `lots` lots of `unitsPerLot` units spread over the last `days` days, half of each product. The
 * newest tenth of the lots is still running (units stop at a random step); about 3 % of first
 * attempts fail and pass at a reworked second attempt; 1.5 % of units are scrapped at a failing
 * step. With 200 × 500 units this gives 100 000 units and about 1 000 000 step runs.
 */
export async function seedYieldBench(opts: {
  lots: number
  unitsPerLot: number
  days: number
}): Promise<BenchSeed> {
  const revisions = [await benchRevision('BY01'), await benchRevision('BY02')]
  // One transaction, so that every statement runs on the connection holding the temp tables.
  return withTransaction(async (transaction) => {
    const q = (sql: string, replacements: Record<string, unknown> = {}) =>
      execute(sql, { replacements, transaction })
    await q('SELECT setseed(0.42)')
    const running = Math.max(1, Math.round(opts.lots / 10))
    await q(
      `INSERT INTO lots (id, number, revision_id, quantity, order_ref, status, released_at, closed_at,
                       created_at, updated_at)
     SELECT gen_random_uuid(), 'B-' || lpad(i::text, 5, '0'), (ARRAY[:revA, :revB]::uuid[])[1 + i % 2],
            :perLot, 'BENCH-' || i,
            CASE WHEN i > :lots - :running THEN 'in_progress' ELSE 'closed' END::lot_status,
            t, CASE WHEN i > :lots - :running THEN NULL ELSE t + interval '6 days' END, t, t
       FROM generate_series(1, :lots) AS i,
            LATERAL (SELECT now() - make_interval(days => :days) + (i - 1) * make_interval(days => :days) / :lots AS t) AS s`,
      {
        revA: revisions[0],
        revB: revisions[1],
        perLot: opts.unitsPerLot,
        lots: opts.lots,
        running,
        days: opts.days,
      },
    )
    // Each unit's plan: how many steps it reaches and the step (if any) where it is scrapped.
    await q(
      `CREATE TEMP TABLE bench_plan ON COMMIT DROP AS
    SELECT gen_random_uuid() AS unit_id, l.id AS lot_id, l.revision_id, l.released_at, l.status, n,
           CASE WHEN l.status = 'in_progress' THEN floor(random() * 11)::int ELSE 10 END AS reach,
           CASE WHEN random() < 0.015 THEN 1 + floor(random() * 10)::int END AS scrap_at
      FROM lots l, generate_series(1, :perLot) AS n
     WHERE l.number LIKE 'B-%'`,
      { perLot: opts.unitsPerLot },
    )
    await q(
      `CREATE TEMP TABLE bench_steps ON COMMIT DROP AS
    SELECT rs.id, rs.revision_id, rs.position, rs.station_kind,
           (SELECT st.id FROM stations st WHERE st.kind::text = rs.station_kind::text ORDER BY st.code LIMIT 1) AS station_id
      FROM route_steps rs WHERE rs.revision_id IN (:revs)`,
      { revs: revisions },
    )
    const [{ operator }] = (await select<{ operator: string }>(
      `SELECT id AS operator FROM users WHERE role = 'operator' ORDER BY email LIMIT 1`,
      { transaction },
    )) as [{ operator: string }]
    // Runs: attempt 1 at every step up to the unit's last one; a failed attempt 1 at a step that
    // is not the scrap step is followed by a passing rework attempt 2.
    await q(`CREATE TEMP TABLE bench_runs ON COMMIT DROP AS
    SELECT gen_random_uuid() AS id, p.unit_id, s.id AS step_id, s.station_id, a.attempt,
           a.attempt = 2 AS is_rework,
           CASE WHEN a.attempt = 2 THEN 'pass'
                WHEN s.position = p.scrap_at OR f.fails THEN 'fail' ELSE 'pass' END::step_result AS result,
           p.released_at + make_interval(mins => p.n * 7 + s.position * 95 + a.attempt * 30) AS finished_at
      FROM bench_plan p
      JOIN bench_steps s ON s.revision_id = p.revision_id
       AND s.position <= least(p.reach, coalesce(p.scrap_at, 10))
      CROSS JOIN LATERAL (SELECT random() < 0.012 + 0.004 * s.position AS fails) f
      CROSS JOIN LATERAL (SELECT 1 AS attempt UNION ALL
                          SELECT 2 WHERE f.fails AND s.position IS DISTINCT FROM p.scrap_at) a`)
    await q(`WITH rework AS (
      SELECT unit_id, count(*) FILTER (WHERE is_rework)::int AS n FROM bench_runs GROUP BY unit_id
    )
    INSERT INTO units (id, serial, lot_id, state, current_step_id, rework_count, finished_at,
                       created_at, updated_at)
    SELECT p.unit_id, 'BY-' || lpad(row_number() OVER (ORDER BY p.lot_id, p.n)::text, 7, '0'),
           p.lot_id,
           CASE WHEN p.scrap_at IS NOT NULL AND p.scrap_at <= p.reach THEN 'scrapped'
                WHEN p.reach = 10 THEN 'passed' ELSE 'queued' END::unit_state,
           CASE WHEN p.scrap_at IS NULL OR p.scrap_at > p.reach THEN ns.id END,
           coalesce(rw.n, 0),
           CASE WHEN p.reach = 10 OR p.scrap_at <= p.reach THEN p.released_at + interval '1 day' END,
           p.released_at, p.released_at
      FROM bench_plan p
      LEFT JOIN rework rw ON rw.unit_id = p.unit_id
      LEFT JOIN bench_steps ns ON ns.revision_id = p.revision_id AND ns.position = p.reach + 1`)
    await q(
      `INSERT INTO step_runs (id, unit_id, step_id, station_id, operator_id, attempt, is_rework,
                                  result, client_event_id, started_at, finished_at)
    SELECT id, unit_id, step_id, station_id, :operator, attempt, is_rework, result,
           gen_random_uuid(), finished_at - interval '4 minutes', finished_at
      FROM bench_runs`,
      { operator },
    )
    // Two readings per run; a failed run has its first reading above the upper limit.
    await q(`INSERT INTO measurements (step_run_id, check_id, value_number, is_pass)
    SELECT r.id, c.id,
           CASE WHEN r.result = 'fail' AND c.position = 1 THEN c.upper * 1.1 + 1
                ELSE c.lower + (c.upper - c.lower) * (0.3 + random() * 0.4) END,
           NOT (r.result = 'fail' AND c.position = 1)
      FROM bench_runs r JOIN checks c ON c.step_id = r.step_id`)
    // Inserted in bulk, not by the scan: count the Yield board's rollups as the scan keeps them.
    for (const sql of REBUILD_YIELD_ROLLUPS) await q(sql)
    return seededBench(opts.lots, transaction)
  })
}

/** The figures of a seeded bench database (also of one kept from an earlier run). */
export async function seededBench(lots: number, transaction?: Transaction): Promise<BenchSeed> {
  type Counts = {
    lots: string
    units: string
    step_runs: string
    measurements: string
    sample: string
  }
  const [counts] = (await select<Counts>(
    `SELECT
      (SELECT count(*) FROM lots WHERE number LIKE 'B-%') AS lots,
      (SELECT count(*) FROM units) AS units,
      (SELECT count(*) FROM step_runs) AS step_runs,
      (SELECT count(*) FROM measurements) AS measurements,
      (SELECT id FROM lots WHERE number = 'B-' || lpad((:lots / 2)::text, 5, '0')) AS sample`,
    { replacements: { lots }, transaction },
  )) as [Counts]
  const day = (offset: number) =>
    new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10)
  return {
    lots: Number(counts.lots),
    units: Number(counts.units),
    stepRuns: Number(counts.step_runs),
    measurements: Number(counts.measurements),
    sampleLotId: counts.sample,
    from: day(-30),
    to: day(0),
  }
}
