import { FINISHED_UNIT_STATES, OPEN_UNIT_STATES, PASSED_UNIT_STATES } from '../../../shared/lots'
import type { StationKind } from '../../../shared/stations'
import type { StepYieldDto } from '../../../shared/schemas/yield'
import { execute, select } from '../../db/sql'

// Yield figures (DESIGN.md §7) aggregated in SQL over step_runs and units: each query returns a
// row per lot, or per lot and route step, never every step run. `yield.ts` assembles the DTOs.

/** One lot's unit counts: the numerators and denominators of lot FPY, final yield and DPU. */
export interface LotUnitTotals {
  started: number
  finished: number
  passed: number
  scrapped: number
  /** Ended passed with one passing first attempt at every route step and no other run. */
  firstPass: number
  /** Failed step runs. */
  defects: number
  /** Step runs of any result: what a kept lot_step_yields row must have been computed from. */
  runs: number
  /** Whether the lot's kept lot_step_yields rows were computed from exactly these `runs`. */
  isKeptCurrent: boolean
}

/** One route step of a lot: first attempts, first-attempt passes and units there now. */
export interface LotStepTotals extends Omit<StepYieldDto, 'fpy' | 'interval'> {
  revisionId: string
  stationKind: StationKind
  wip: number
}

const STATES = {
  finished: FINISHED_UNIT_STATES,
  passed: PASSED_UNIT_STATES,
  open: [...OPEN_UNIT_STATES, 'on_hold'],
}

// Postgres returns bigint counts as strings.
interface UnitTotalsRow {
  lot_id: string
  started: string
  finished: string
  passed: string
  scrapped: string
  first_pass: string
  defects: string
  runs: string
  kept_runs: number | null
}

/** Unit counts per lot, keyed by lot id; a lot without units gets no entry. */
export async function lotUnitTotals(
  lotIds: readonly string[],
): Promise<Map<string, LotUnitTotals>> {
  if (!lotIds.length) return new Map()
  const rows = await select<UnitTotalsRow>(
    // The per-unit counts are kept by the scan's statement (stepRuns.ts): runs at distinct steps
    // are first attempts; a clean unit has no fail and no attempt after a first.
    // MATERIALIZED: inlined, the route's step count became a sub-query per unit (67 ms → 14 ms
    // for the 30-day board in scripts/bench/yield.ts).
    `WITH route AS MATERIALIZED (
       SELECT l.id, (SELECT count(*) FROM route_steps WHERE revision_id = l.revision_id) AS n,
              (SELECT max(runs) FROM lot_step_yields y WHERE y.lot_id = l.id) AS kept_runs
         FROM lots l WHERE l.id IN (:lotIds)
     )
     SELECT u.lot_id, route.kept_runs,
            count(*) FILTER (WHERE u.run_count > 0) AS started,
            count(*) FILTER (WHERE u.state IN (:finished)) AS finished,
            count(*) FILTER (WHERE u.state IN (:passed)) AS passed,
            count(*) FILTER (WHERE u.state = 'scrapped') AS scrapped,
            -- Clean runs at as many steps as the route has: one first-attempt pass at each.
            count(*) FILTER (WHERE u.state IN (:passed) AND u.run_count > 0
                               AND u.fail_count = 0 AND u.run_count = u.first_attempt_count
                               AND u.first_attempt_count = route.n)
              AS first_pass,
            coalesce(sum(u.fail_count), 0) AS defects,
            coalesce(sum(u.run_count), 0) AS runs
       FROM units u JOIN route ON route.id = u.lot_id
      WHERE u.lot_id IN (:lotIds)
      GROUP BY u.lot_id, route.n, route.kept_runs`,
    { replacements: { lotIds, ...STATES } },
  )
  return new Map(
    rows.map((r) => [
      r.lot_id,
      {
        started: Number(r.started),
        finished: Number(r.finished),
        passed: Number(r.passed),
        scrapped: Number(r.scrapped),
        firstPass: Number(r.first_pass),
        defects: Number(r.defects),
        runs: Number(r.runs),
        isKeptCurrent: r.kept_runs !== null && r.kept_runs === Number(r.runs),
      },
    ]),
  )
}

interface StepRow {
  lot_id: string
  revision_id: string
  step_id: string
  name: string
  position: number
  station_kind: StationKind
  first_attempts: string | null
  passed_first: string | null
  runs: string | null
  wip: string | null
}

const NO_LOT = '00000000-0000-0000-0000-000000000000'
/** An IN list that may be empty (SQL has no empty IN list). */
const orNone = (ids: readonly string[]) => (ids.length ? ids : [NO_LOT])

/**
 * Every route step of each lot, in route order, keyed by lot id. Given the lots' unit totals, a
 * lot whose kept lot_step_yields rows were computed from its present step-run count is read from
 * them; the others are counted from their step runs, and those with no unit left in work are
 * kept for next time.
 */
export async function lotStepTotals(
  lotIds: readonly string[],
  units?: ReadonlyMap<string, LotUnitTotals>,
): Promise<Map<string, LotStepTotals[]>> {
  const byLot = new Map<string, LotStepTotals[]>(lotIds.map((id) => [id, []]))
  if (!lotIds.length) return byLot
  const kept = lotIds.filter((id) => units?.get(id)?.isKeptCurrent)
  const keptSet = new Set(kept)
  const counted = lotIds.filter((id) => !keptSet.has(id))
  const rows = await select<StepRow>(
    `SELECT l.id AS lot_id, rs.revision_id, rs.id AS step_id, rs.name, rs.position, rs.station_kind,
            a.first_attempts, a.passed_first, a.runs, w.wip
       FROM lots l
       JOIN route_steps rs ON rs.revision_id = l.revision_id
       LEFT JOIN (
         SELECT lot_id, step_id, first_attempts, passed_first, runs
           FROM lot_step_yields WHERE lot_id IN (:kept)
         UNION ALL
         SELECT u.lot_id, sr.step_id,
                count(*) FILTER (WHERE sr.attempt = 1) AS first_attempts,
                count(*) FILTER (WHERE sr.attempt = 1 AND sr.result = 'pass') AS passed_first,
                count(*) AS runs
           FROM units u JOIN step_runs sr ON sr.unit_id = u.id
          WHERE u.lot_id IN (:counted)
          GROUP BY u.lot_id, sr.step_id
       ) a ON a.lot_id = l.id AND a.step_id = rs.id
       LEFT JOIN (
         SELECT lot_id, current_step_id, count(*) AS wip
           FROM units
          WHERE lot_id IN (:lotIds) AND state IN (:open) AND current_step_id IS NOT NULL
          GROUP BY lot_id, current_step_id
       ) w ON w.lot_id = l.id AND w.current_step_id = rs.id
      WHERE l.id IN (:lotIds)
      ORDER BY l.id, rs.position`,
    {
      replacements: { lotIds, kept: orNone(kept), counted: orNone(counted), open: STATES.open },
    },
  )
  const runsCounted = new Map<string, number>()
  for (const r of rows) {
    byLot.get(r.lot_id)?.push({
      revisionId: r.revision_id,
      stepId: r.step_id,
      name: r.name,
      position: r.position,
      stationKind: r.station_kind,
      firstAttempts: Number(r.first_attempts ?? 0),
      passedFirst: Number(r.passed_first ?? 0),
      wip: Number(r.wip ?? 0),
    })
    if (!keptSet.has(r.lot_id))
      runsCounted.set(r.lot_id, (runsCounted.get(r.lot_id) ?? 0) + Number(r.runs ?? 0))
  }
  await keepSettledLots(byLot, runsCounted)
  return byLot
}

/**
 * Keeps the step figures of counted lots that have runs and no unit in work, where they are
 * most likely to stay as they are. Two readers keeping the same lot write the same rows.
 */
async function keepSettledLots(
  byLot: ReadonlyMap<string, LotStepTotals[]>,
  runsCounted: ReadonlyMap<string, number>,
): Promise<void> {
  const rows: { lotId: string; stepId: string; first: number; passed: number; runs: number }[] = []
  for (const [lotId, runs] of runsCounted) {
    const steps = byLot.get(lotId) ?? []
    if (runs === 0 || steps.some((s) => s.wip > 0)) continue
    for (const s of steps)
      rows.push({ lotId, stepId: s.stepId, first: s.firstAttempts, passed: s.passedFirst, runs })
  }
  if (!rows.length) return
  await execute(
    `INSERT INTO lot_step_yields (lot_id, step_id, first_attempts, passed_first, runs)
     SELECT * FROM unnest(CAST(:lotIds AS uuid[]), CAST(:stepIds AS uuid[]),
                          CAST(:firsts AS int[]), CAST(:passes AS int[]), CAST(:runs AS int[]))
     ON CONFLICT (lot_id, step_id) DO UPDATE
       SET first_attempts = EXCLUDED.first_attempts, passed_first = EXCLUDED.passed_first,
           runs = EXCLUDED.runs`,
    {
      replacements: {
        lotIds: `{${rows.map((r) => r.lotId).join(',')}}`,
        stepIds: `{${rows.map((r) => r.stepId).join(',')}}`,
        firsts: `{${rows.map((r) => r.first).join(',')}}`,
        passes: `{${rows.map((r) => r.passed).join(',')}}`,
        runs: `{${rows.map((r) => r.runs).join(',')}}`,
      },
    },
  )
}

/** A lot of the board's table, with the names its row shows. */
export interface PeriodLot {
  lotId: string
  number: string
  productCode: string
  revisionLetter: string
}

/**
 * Lots with at least one step run finished in the period (whole UTC days, `to` included), newest
 * lot first, optionally of one product or revision.
 */
export async function lotsRunInPeriod(filter: {
  from: string
  to: string
  productId?: string
  revisionId?: string
}): Promise<PeriodLot[]> {
  const where = [
    // lot_run_days is kept by the scan's statement: one row per lot and UTC day with a run.
    `l.id IN (SELECT lot_id FROM lot_run_days
               WHERE day BETWEEN CAST(:from AS date) AND CAST(:to AS date))`,
  ]
  if (filter.productId) where.push('r.product_id = :productId')
  if (filter.revisionId) where.push('r.id = :revisionId')
  return select<PeriodLot>(
    `SELECT l.id AS "lotId", l.number, p.code AS "productCode", r.letter AS "revisionLetter"
       FROM lots l
       JOIN revisions r ON r.id = l.revision_id
       JOIN products p ON p.id = r.product_id
      WHERE ${where.join(' AND ')}
      ORDER BY l.created_at DESC, l.number`,
    { replacements: { ...filter } },
  )
}

/** Service cases (field returns) logged against each lot's units, keyed by lot id. */
export async function lotFieldReturns(lotIds: readonly string[]): Promise<Map<string, number>> {
  if (!lotIds.length) return new Map()
  // service_cases_unit_idx and units_lot_idx serve the join; one row per lot comes back.
  const rows = await select<{ lot_id: string; n: string }>(
    `SELECT u.lot_id, count(*) AS n
       FROM service_cases sc JOIN units u ON u.id = sc.unit_id
      WHERE u.lot_id IN (:lotIds)
      GROUP BY u.lot_id`,
    { replacements: { lotIds } },
  )
  return new Map(rows.map((r) => [r.lot_id, Number(r.n)]))
}
