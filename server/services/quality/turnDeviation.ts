import { capability } from '../../../shared/quality/spc'
import {
  deviationChart,
  histogram,
  MEDIAN_MIN_RUNS,
  MEDIAN_SUSPECT_TURNS,
  turnVerdict,
} from '../../../shared/quality/turnReview'
import type {
  LotTurnDeviationDto,
  TurnChartDto,
  TurnGroupDto,
  TurnRunDto,
  WindingTurnsDto,
} from '../../../shared/schemas/yield'
import { fromSi, toSi } from '../../../shared/units'
import type { Unit as UnitSymbol } from '../../../shared/units'
import { AppError } from '../../errors'
import { turnSummary } from './turnSummary'
import { select } from '../../db/sql'

// Turn-count deviation of a lot (issue #5 point 3). Self-contained: the lot report PDF calls
// `lotTurnDeviation` too. Per winding, one SQL query returns one row per winding run (one per
// unit, plus rewinds) with the lot median inductance from `percentile_cont`, and one aggregate
// query groups the same runs by bench and by operator; the charts, histogram and capability are
// then computed from the per-unit rows with the shared SPC code.

interface CheckMeta {
  id: string
  key: string
  label: string
  unit: string | null
  lower: number | null
  upper: number | null
  nominal: number | null
  stepId: string
  derived: string | null
  inputs: Record<string, string> | null
}

interface WindingMeta {
  id: string
  name: string
  nominalTurns: number
  alNanoHenry: number
  alTolerancePercent: number
}

/** The checks that measure a winding: its inductance, and the ratio test that counts it. */
interface WindingChecks {
  inductance: CheckMeta | null
  ratio: CheckMeta | null
  stepId: string
}

/**
 * Which checks measure each winding. The inductance check is the input of a
 * `turns_from_inductance` or `turn_deviation` check naming the winding. A
 * `secondary_turns_from_ratio` check names only the driven winding, so it counts the other
 * winding whose nominal turns it has as its nominal (or the only other winding). Runs are
 * those of the inductance check's step; a ratio check on another step is left out.
 */
export function windingChecks(
  windings: readonly WindingMeta[],
  checks: readonly CheckMeta[],
): Map<string, WindingChecks> {
  const byKey = new Map(checks.map((c) => [c.key, c]))
  const out = new Map<string, WindingChecks>()
  for (const w of windings) {
    const turns = checks.find(
      (c) =>
        (c.derived === 'turns_from_inductance' || c.derived === 'turn_deviation') &&
        c.inputs?.winding === w.id,
    )
    const inductance = (turns && byKey.get(turns.inputs?.inductance ?? '')) || null
    const ratio =
      checks.find((c) => {
        if (c.derived !== 'secondary_turns_from_ratio' || c.inputs?.primaryWinding === w.id)
          return false
        const others = windings.filter((o) => o.id !== c.inputs?.primaryWinding)
        return c.nominal !== null ? c.nominal === w.nominalTurns : others.length === 1
      }) ?? null
    const stepId = inductance?.stepId ?? ratio?.stepId
    if (!stepId) continue
    out.set(w.id, { inductance, ratio: ratio?.stepId === stepId ? ratio : null, stepId })
  }
  return out
}

interface RunRow {
  step_run_id: string
  serial: string
  attempt: number
  finished_at: Date
  station_code: string
  operator_name: string
  inductance: number | null
  ratio_turns: number | null
  median_l: number | null
  ratio_suspect: boolean | null
  median_suspect: boolean | null
}

interface GroupRow {
  station_code: string | null
  operator_name: string | null
  runs: string
  suspects: string
  mean_ratio_dev: number | null
  mean_median_dev: number | null
}

// Winding runs of one lot at one step, with the measurements of two checks and the lot median
// of the inductance. Suspects: the ratio rounds to another whole turn (floor(x + 0.5), as
// Math.round does), or the inductance implies ≥ MEDIAN_SUSPECT_TURNS off the lot median, which
// is only taken with MEDIAN_MIN_RUNS readings or more.
const RUNS_CTE = `
  WITH runs AS (
    SELECT sr.id AS step_run_id, u.serial, sr.attempt, sr.finished_at,
           st.code AS station_code, us.name AS operator_name,
           mi.value_number AS inductance, mr.value_number AS ratio_turns
      FROM units u
      JOIN step_runs sr ON sr.unit_id = u.id AND sr.step_id = :stepId
      JOIN stations st ON st.id = sr.station_id
      JOIN users us ON us.id = sr.operator_id
      LEFT JOIN measurements mi ON mi.step_run_id = sr.id AND mi.check_id = :inductanceCheckId
      LEFT JOIN measurements mr ON mr.step_run_id = sr.id AND mr.check_id = :ratioCheckId
     WHERE u.lot_id = :lotId
  ), med AS (
    SELECT CASE WHEN count(*) >= :medianMinRuns
                THEN percentile_cont(0.5) WITHIN GROUP (ORDER BY inductance) END AS median_l
      FROM runs WHERE inductance > 0
  ), flagged AS (
    SELECT runs.*, med.median_l,
           runs.ratio_turns - :nominal AS ratio_dev,
           CASE WHEN runs.inductance > 0 AND med.median_l > 0
                THEN :nominal * sqrt(runs.inductance / med.median_l) - :nominal END AS median_dev
      FROM runs CROSS JOIN med
  ), judged AS (
    SELECT flagged.*,
           coalesce(floor(ratio_turns + 0.5) <> :nominal, false) AS ratio_suspect,
           coalesce(abs(median_dev) >= :medianTurns, false) AS median_suspect
      FROM flagged
  )`

const NONE = '00000000-0000-0000-0000-000000000000'

async function windingRuns(lotId: string, w: WindingMeta, c: WindingChecks) {
  const replacements = {
    lotId,
    stepId: c.stepId,
    inductanceCheckId: c.inductance?.id ?? NONE,
    ratioCheckId: c.ratio?.id ?? NONE,
    nominal: w.nominalTurns,
    medianTurns: MEDIAN_SUSPECT_TURNS,
    medianMinRuns: MEDIAN_MIN_RUNS,
  }
  const [runs, groups] = await Promise.all([
    select<RunRow>(
      `${RUNS_CTE}
       SELECT step_run_id, serial, attempt, finished_at, station_code, operator_name,
              inductance, ratio_turns, median_l, ratio_suspect, median_suspect
         FROM judged ORDER BY finished_at, serial, attempt`,
      { replacements },
    ),
    select<GroupRow>(
      `${RUNS_CTE}
       SELECT station_code, operator_name, count(*) AS runs,
              count(*) FILTER (WHERE ratio_suspect OR median_suspect) AS suspects,
              avg(ratio_dev) AS mean_ratio_dev, avg(median_dev) AS mean_median_dev
         FROM judged
        GROUP BY GROUPING SETS ((station_code), (operator_name))
        ORDER BY station_code, operator_name`,
      { replacements },
    ),
  ])
  return { runs, groups }
}

function turnRun(r: RunRow, w: WindingMeta, unit: UnitSymbol | null): TurnRunDto {
  const nominal = w.nominalTurns
  const inductanceH = r.inductance !== null && unit ? toSi(r.inductance, unit) : null
  const fromL =
    inductanceH && inductanceH > 0 ? Math.sqrt(inductanceH / (w.alNanoHenry * 1e-9)) : null
  const offMedian =
    r.inductance !== null && r.median_l ? nominal * Math.sqrt(r.inductance / r.median_l) : null
  const suspectBy: TurnRunDto['suspectBy'] = []
  if (r.ratio_suspect) suspectBy.push('ratio')
  if (r.median_suspect) suspectBy.push('median')
  return {
    stepRunId: r.step_run_id,
    serial: r.serial,
    attempt: r.attempt,
    finishedAt: new Date(r.finished_at).toISOString(),
    stationCode: r.station_code,
    operatorName: r.operator_name,
    inductance: r.inductance,
    turnsFromRatio: r.ratio_turns,
    ratioDeviation: r.ratio_turns === null ? null : r.ratio_turns - nominal,
    turnsFromInductance: fromL,
    inductanceDeviation: fromL === null ? null : fromL - nominal,
    offMedianPercent:
      r.inductance !== null && r.median_l ? (r.inductance / r.median_l - 1) * 100 : null,
    medianDeviation: offMedian === null ? null : offMedian - nominal,
    isSuspect: suspectBy.length > 0,
    suspectBy,
  }
}

function chartOf(runs: TurnRunDto[], basis: 'ratio' | 'median'): TurnChartDto | null {
  const values = runs.flatMap((r, index) => {
    const value = basis === 'ratio' ? r.ratioDeviation : r.medianDeviation
    return value === null ? [] : [{ index, serial: r.serial, value }]
  })
  if (!values.length) return null
  const chart = deviationChart(values.map((v) => v.value))
  // Violations index the plotted values; map them back to build-order positions.
  const violations = chart.violations.map((v) => ({ ...v, index: values[v.index]!.index }))
  return { basis, values, ...chart, violations }
}

const groupOf = (g: GroupRow, label: string): TurnGroupDto => ({
  label,
  runs: Number(g.runs),
  suspects: Number(g.suspects),
  meanRatioDeviation: g.mean_ratio_dev === null ? null : Number(g.mean_ratio_dev),
  meanMedianDeviation: g.mean_median_dev === null ? null : Number(g.mean_median_dev),
})

async function windingTurns(
  lotId: string,
  w: WindingMeta,
  c: WindingChecks,
): Promise<WindingTurnsDto> {
  const { runs: rows, groups } = await windingRuns(lotId, w, c)
  const unit = (c.inductance?.unit ?? null) as UnitSymbol | null
  const runs = rows.map((r) => turnRun(r, w, unit))
  const inductances = runs.flatMap((r) => (r.inductance === null ? [] : [r.inductance]))
  const nominalInductance = unit ? fromSi(w.alNanoHenry * 1e-9 * w.nominalTurns ** 2, unit) : null
  const median = rows[0]?.median_l ?? null
  const suspects = runs.filter((r) => r.isSuspect).length
  const limits = {
    ...(c.inductance?.lower != null ? { lower: c.inductance.lower } : {}),
    ...(c.inductance?.upper != null ? { upper: c.inductance.upper } : {}),
  }
  const verdict = turnVerdict({
    runs: runs.length,
    suspects,
    nominalTurns: w.nominalTurns,
    medianToNominal: median !== null && nominalInductance ? median / nominalInductance : null,
  })
  const byStation = groups.filter((g) => g.station_code !== null)
  const base = {
    windingId: w.id,
    name: w.name,
    nominalTurns: w.nominalTurns,
    alNanoHenry: w.alNanoHenry,
    alTolerancePercent: w.alTolerancePercent,
    inductanceCheck: c.inductance && {
      key: c.inductance.key,
      label: c.inductance.label,
      unit: c.inductance.unit ?? '',
      lower: c.inductance.lower,
      upper: c.inductance.upper,
    },
    ratioCheckKey: c.ratio?.key ?? null,
    runs,
    histogram: histogram(
      [
        runs.flatMap((r) => (r.ratioDeviation === null ? [] : [r.ratioDeviation])),
        runs.flatMap((r) => (r.inductanceDeviation === null ? [] : [r.inductanceDeviation])),
      ],
      0.5,
    ).map((b) => ({ from: b.from, to: b.to, ratio: b.counts[0]!, inductance: b.counts[1]! })),
    ratioChart: chartOf(runs, 'ratio'),
    medianChart: chartOf(runs, 'median'),
    capability: inductances.length ? capability(inductances, limits) : null,
    nominalInductance,
    lotMedianInductance: median,
    lotOffsetPercent:
      median !== null && nominalInductance ? (median / nominalInductance - 1) * 100 : null,
    suspects,
    verdict,
    byStation: byStation.map((g) => groupOf(g, g.station_code!)),
    byOperator: groups
      .filter((g) => g.operator_name !== null)
      .map((g) => groupOf(g, g.operator_name!)),
  }
  return { ...base, summary: turnSummary(base) }
}

/**
 * The turn-count deviation of every winding of the lot's revision that has magnetics data and
 * a linked inductance or ratio check: per-unit estimates from the ratio test (precise) and the
 * inductance (coarse), histogram, individuals charts with run-rule violations, inductance
 * capability, suspected miscounts, the comparison with the lot's own median inductance, a
 * verdict (core lot or miscount) and the breakdown by winding bench and operator.
 * @param lotId the lot's id; a 404 AppError when there is no such lot
 */
export async function lotTurnDeviation(lotId: string): Promise<LotTurnDeviationDto> {
  const [lot] = await select<{
    number: string
    revision_id: string
    product_code: string
    letter: string
  }>(
    `SELECT l.number, l.revision_id, p.code AS product_code, r.letter
       FROM lots l JOIN revisions r ON r.id = l.revision_id JOIN products p ON p.id = r.product_id
      WHERE l.id = :lotId`,
    { replacements: { lotId } },
  )
  if (!lot) throw AppError.notFound(`lot ${lotId}`)
  const replacements = { revisionId: lot.revision_id }
  const [windings, checks] = await Promise.all([
    select<WindingMeta>(
      `SELECT id, name, nominal_turns AS "nominalTurns", al_nano_henry AS "alNanoHenry",
              al_tolerance_percent AS "alTolerancePercent"
         FROM windings WHERE revision_id = :revisionId ORDER BY position`,
      { replacements },
    ),
    select<CheckMeta>(
      `SELECT id, key, label, unit, lower, upper, nominal, step_id AS "stepId", derived,
              derived_inputs AS inputs
         FROM checks WHERE revision_id = :revisionId AND kind = 'numeric'`,
      { replacements },
    ),
  ])
  const linked = windingChecks(windings, checks)
  const out: WindingTurnsDto[] = []
  for (const w of windings) {
    const c = linked.get(w.id)
    if (c) out.push(await windingTurns(lotId, w, c))
  }
  return {
    lotId,
    lotNumber: lot.number,
    productCode: lot.product_code,
    revisionLetter: lot.letter,
    windings: out,
  }
}
