import { QueryTypes } from 'sequelize'
import { turnDeviation, secondaryTurnsFromRatio } from '../../shared/magnetics'
import { dpuInterval } from '../../shared/quality/poisson'
import type { RateInterval } from '../../shared/quality/poisson'
import { capability, individualsChart, runRuleViolations } from '../../shared/quality/spc'
import type { Capability, IndividualsChart, RuleViolation } from '../../shared/quality/spc'
import type { LotStatus } from '../../shared/lots'
import type { NonconformanceDto } from '../../shared/schemas/lots'
import type { CheckDto, RevisionDto, WindingDto } from '../../shared/schemas/recipes'
import type { LotYieldDto } from '../../shared/schemas/yield'
import { toSi, UNITS } from '../../shared/units'
import type { Unit } from '../../shared/units'
import { AppError } from '../errors'
import { db, Lot } from '../models'
import { listNonconformances } from './nonconformances'
import { toRevisionDto } from './recipePresenters'
import { loadRevision } from './revisionAccess'
import { getLotYield } from './yield'
import { lotUnitTotals } from './yieldQueries'

// Everything the lot report PDF shows, gathered in one place so the renderer stays a pure
// function of this data (and so the tests can compare the PDF's text with these figures).

/** A bar of the defect-code Pareto: nonconformances opened with this code. */
export interface ParetoBar {
  code: string
  description: string
  count: number
}

/** Capability of one numeric check over every recorded value of it in the lot. */
export interface CheckCapability extends Capability {
  stepName: string
  key: string
  label: string
  unit: string | null
  lower: number | null
  upper: number | null
  decimals: number
}

/** One unit's turn deviation at one winding run, in build order. */
export interface TurnPoint {
  serial: string
  station: string
  operator: string
  finishedAt: string
  estimatedTurns: number
  deviation: number
  /**
   * Ratio method: the estimate rounds to another whole turn than the nominal. Inductance method:
   * it rounds to another whole turn than the lot's own median estimate, since the core lot's AL
   * (±25 % on ungapped ferrite) shifts every unit alike and only a unit off the rest is suspect.
   */
  miscount: boolean
}

/** A turn-deviation series of one winding, by one method, with its individuals chart. */
export interface TurnSeries {
  winding: string
  nominalTurns: number
  /** ratio: from the voltage-ratio test (precise); inductance: from L = AL·N² (coarse). */
  method: 'ratio' | 'inductance'
  /** Median estimated turns of the lot (inductance method; null for ratio or no points). */
  medianTurns: number | null
  points: TurnPoint[]
  /** Null with fewer than 2 points. */
  chart: IndividualsChart | null
  violations: RuleViolation[]
}

export interface LotReportData {
  lot: {
    number: string
    status: LotStatus
    quantity: number
    orderRef: string
    customerName: string
    dueDate: string | null
    releasedAt: Date | null
    closedAt: Date | null
    createdAt: Date
  }
  product: { code: string; name: string }
  revision: { letter: string }
  /** The latest step run or nonconformance decision the figures include (or the release). */
  asOf: Date
  yield: LotYieldDto
  dpu: { value: number | null; interval: RateInterval; defects: number }
  pareto: ParetoBar[]
  turnSeries: TurnSeries[]
  capability: CheckCapability[]
  nonconformances: NonconformanceDto[]
}

interface MeasurementRow {
  step_run_id: string
  check_id: string
  value_number: number | null
  serial: string
  station: string
  operator: string
  finished_at: Date
}

/** Numeric values of the given checks in the lot, in build order (time the run finished). */
async function numericValues(lotId: string, checkIds: readonly string[]) {
  if (!checkIds.length) return []
  return db().query<MeasurementRow>(
    `SELECT m.step_run_id, m.check_id, m.value_number, u.serial, st.code AS station,
            us.name AS operator, sr.finished_at
       FROM measurements m
       JOIN step_runs sr ON sr.id = m.step_run_id
       JOIN units u ON u.id = sr.unit_id
       JOIN stations st ON st.id = sr.station_id
       JOIN users us ON us.id = sr.operator_id
      WHERE u.lot_id = :lotId AND m.check_id IN (:checkIds) AND m.value_number IS NOT NULL
      ORDER BY sr.finished_at, u.serial, m.step_run_id`,
    { replacements: { lotId, checkIds }, type: QueryTypes.SELECT },
  )
}

const si = (value: number, check: CheckDto | undefined): number | null =>
  check?.unit && check.unit in UNITS ? toSi(value, check.unit as Unit) : null

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

function chartOf(points: readonly TurnPoint[]) {
  const values = points.map((p) => p.deviation)
  if (values.length < 2) return { chart: null, violations: [] }
  const chart = individualsChart(values)
  const sigma = (chart.ucl - chart.center) / 3
  return { chart, violations: sigma > 0 ? runRuleViolations(values, chart.center, sigma) : [] }
}

/**
 * The lot's turn-count deviation series, computed here from the measurements with
 * `shared/magnetics.ts` and `shared/quality/spc.ts`. Kept in this one function so that it can
 * be replaced by the shared turn-deviation service when that lands. For each derived check of
 * the revision that estimates turns, every run of its step in build order:
 * - `secondary_turns_from_ratio`: N_s = N_p·V_s/V_p minus the check's nominal turns (precise);
 * - `turn_deviation` / `turns_from_inductance`: √(L/AL) minus the winding's nominal (coarse).
 * One series per winding and method; the precise series come first.
 */
export async function lotTurnDeviationSeries(
  lotId: string,
  rev: Pick<RevisionDto, 'steps' | 'windings'>,
): Promise<TurnSeries[]> {
  const checks = rev.steps.flatMap((s) => s.checks)
  const byKey = new Map(checks.map((c) => [c.key, c]))
  const windingOf = (id: string | undefined): WindingDto | undefined =>
    rev.windings.find((w) => w.id === id)
  interface Plan {
    winding: WindingDto
    nominalTurns: number
    method: TurnSeries['method']
    inputs: CheckDto[]
    estimate: (values: Map<string, number>) => number | null
  }
  const plans: Plan[] = []
  const seen = new Set<string>()
  for (const c of checks) {
    const inputs = c.derivedInputs ?? {}
    if (c.derived === 'secondary_turns_from_ratio') {
      const primary = windingOf(inputs.primaryWinding)
      const vp = byKey.get(inputs.primaryVolts ?? '')
      const vs = byKey.get(inputs.secondaryVolts ?? '')
      // The secondary's nominal is the check's own; the winding is the one with those turns.
      const nominal = c.nominal
      if (!primary || !vp || !vs || nominal === null) continue
      const secondary = rev.windings.find((w) => w.nominalTurns === nominal && w.id !== primary.id)
      plans.push({
        winding: secondary ?? { ...primary, name: c.label, nominalTurns: nominal },
        nominalTurns: nominal,
        method: 'ratio',
        inputs: [vp, vs],
        estimate: (v) => {
          const p = v.has(vp.id) ? si(v.get(vp.id)!, vp) : null
          const s = v.has(vs.id) ? si(v.get(vs.id)!, vs) : null
          return p !== null && s !== null && p > 0
            ? secondaryTurnsFromRatio(primary.nominalTurns, p, s)
            : null
        },
      })
    } else if (c.derived === 'turn_deviation' || c.derived === 'turns_from_inductance') {
      const winding = windingOf(inputs.winding)
      const l = byKey.get(inputs.inductance ?? '')
      if (!winding || !l || seen.has(`${winding.id}:${l.id}`)) continue
      seen.add(`${winding.id}:${l.id}`)
      plans.push({
        winding,
        nominalTurns: winding.nominalTurns,
        method: 'inductance',
        inputs: [l],
        estimate: (v) => {
          const h = v.has(l.id) ? si(v.get(l.id)!, l) : null
          return h !== null && h > 0
            ? turnDeviation({
                nominalTurns: winding.nominalTurns,
                inductanceH: h,
                alNanoHenry: winding.alNanoHenry,
              }).estimatedTurns
            : null
        },
      })
    }
  }
  plans.sort((a, b) => (a.method === b.method ? 0 : a.method === 'ratio' ? -1 : 1))
  const rows = await numericValues(lotId, [
    ...new Set(plans.flatMap((p) => p.inputs.map((c) => c.id))),
  ])
  const runs = new Map<string, { row: MeasurementRow; values: Map<string, number> }>()
  for (const r of rows) {
    const run = runs.get(r.step_run_id) ?? { row: r, values: new Map<string, number>() }
    run.values.set(r.check_id, Number(r.value_number))
    runs.set(r.step_run_id, run)
  }
  return plans.map((plan) => {
    const points: TurnPoint[] = []
    for (const { row, values } of runs.values()) {
      const estimatedTurns = plan.estimate(values)
      if (estimatedTurns === null || !Number.isFinite(estimatedTurns)) continue
      points.push({
        serial: row.serial,
        station: row.station,
        operator: row.operator,
        finishedAt: new Date(row.finished_at).toISOString(),
        estimatedTurns,
        deviation: estimatedTurns - plan.nominalTurns,
        miscount: Math.round(estimatedTurns) !== Math.round(plan.nominalTurns),
      })
    }
    const medianTurns =
      plan.method === 'inductance' && points.length
        ? median(points.map((p) => p.estimatedTurns))
        : null
    if (medianTurns !== null)
      for (const p of points) p.miscount = Math.round(p.estimatedTurns - medianTurns) !== 0
    return {
      winding: plan.winding.name,
      nominalTurns: plan.nominalTurns,
      method: plan.method,
      medianTurns,
      points,
      ...chartOf(points),
    }
  })
}

/** Capability of every numeric check of the route that has values in the lot. */
async function checkCapabilities(
  lotId: string,
  rev: Pick<RevisionDto, 'steps'>,
): Promise<CheckCapability[]> {
  const numeric = rev.steps.flatMap((s) =>
    s.checks.filter((c) => c.kind === 'numeric').map((c) => ({ step: s, check: c })),
  )
  const rows = await numericValues(
    lotId,
    numeric.map((n) => n.check.id),
  )
  const values = new Map<string, number[]>()
  for (const r of rows) {
    const list = values.get(r.check_id) ?? []
    list.push(Number(r.value_number))
    values.set(r.check_id, list)
  }
  return numeric
    .filter(({ check }) => values.has(check.id))
    .map(({ step, check }) => ({
      stepName: step.name,
      key: check.key,
      label: check.label,
      unit: check.unit,
      lower: check.lower,
      upper: check.upper,
      decimals: check.decimals,
      ...capability(values.get(check.id)!, {
        lower: check.lower ?? undefined,
        upper: check.upper ?? undefined,
      }),
    }))
}

/** Nonconformances per defect code, most frequent first; runs with no code count as "none". */
async function defectPareto(lotId: string): Promise<ParetoBar[]> {
  const rows = await db().query<{ code: string | null; description: string | null; n: string }>(
    `SELECT dc.code, dc.description, count(*) AS n
       FROM nonconformances nc
       JOIN units u ON u.id = nc.unit_id
       LEFT JOIN defect_codes dc ON dc.id = nc.defect_code_id
      WHERE u.lot_id = :lotId
      GROUP BY dc.code, dc.description
      ORDER BY count(*) DESC, dc.code NULLS LAST`,
    { replacements: { lotId }, type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    code: r.code ?? 'none',
    description: r.description ?? 'no defect code given',
    count: Number(r.n),
  }))
}

async function latestActivity(lotId: string): Promise<Date | null> {
  const [row] = await db().query<{ at: Date | null }>(
    `SELECT greatest(
              (SELECT max(sr.finished_at) FROM step_runs sr JOIN units u ON u.id = sr.unit_id
                WHERE u.lot_id = :lotId),
              (SELECT max(nc.closed_at) FROM nonconformances nc JOIN units u ON u.id = nc.unit_id
                WHERE u.lot_id = :lotId)) AS at`,
    { replacements: { lotId }, type: QueryTypes.SELECT },
  )
  return row?.at ? new Date(row.at) : null
}

/** Gathers the lot report's figures; 404 for an unknown lot. */
export async function loadLotReportData(lotId: string): Promise<LotReportData> {
  const lot = await Lot.findByPk(lotId)
  if (!lot) throw AppError.notFound(`lot ${lotId}`)
  const rev = toRevisionDto(await loadRevision(lot.revisionId))
  const [y, totals, pareto, turnSeries, caps, ncs, latest] = await Promise.all([
    getLotYield(lotId),
    lotUnitTotals([lotId]),
    defectPareto(lotId),
    lotTurnDeviationSeries(lotId, rev),
    checkCapabilities(lotId, rev),
    listNonconformances({ lotId }),
    latestActivity(lotId),
  ])
  // Failed step runs: the numerator of DPU (DESIGN.md §7).
  const defects = totals.get(lotId)?.defects ?? 0
  return {
    lot: {
      number: lot.number,
      status: lot.status,
      quantity: lot.quantity,
      orderRef: lot.orderRef,
      customerName: lot.customerName,
      dueDate: lot.dueDate,
      releasedAt: lot.releasedAt,
      closedAt: lot.closedAt,
      createdAt: lot.createdAt,
    },
    product: { code: rev.productCode, name: rev.productName },
    revision: { letter: rev.letter },
    asOf: latest ?? lot.closedAt ?? lot.releasedAt ?? lot.createdAt,
    yield: y,
    dpu: { ...dpuInterval(defects, y.started), defects },
    pareto,
    turnSeries,
    capability: caps,
    nonconformances: ncs,
  }
}
