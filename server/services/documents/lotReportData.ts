import { dpuInterval } from '../../../shared/quality/poisson'
import { capability } from '../../../shared/quality/spc'
import type { RevisionDto } from '../../../shared/schemas/recipes'
import type { TurnChartDto, WindingTurnsDto } from '../../../shared/schemas/yield'
import type {
  CheckCapability,
  LotReportData,
  ParetoBar,
  TurnPoint,
  TurnSeries,
} from '../../documents/lotReportTypes'
import { AppError } from '../../errors'
import { Lot } from '../../models'
import { select } from '../../db/sql'
import { listNonconformances } from '../quality'
import { toRevisionDto } from '../recipes'
import { loadRevision } from '../recipes'
import { lotKeyCheckSeries, lotTurnDeviation } from '../quality'
import { getLotYield } from '../quality'
import { lotUnitTotals } from '../quality'

// Gathers everything the lot report PDF shows (the types are in server/documents/
// lotReportTypes.ts), so the renderer stays a pure function of this data.

interface MeasurementRow {
  step_run_id: string
  check_id: string
  value_number: number | null
}

/** Numeric values of the given checks in the lot. */
async function numericValues(lotId: string, checkIds: readonly string[]) {
  if (!checkIds.length) return []
  return select<MeasurementRow>(
    `SELECT m.step_run_id, m.check_id, m.value_number
       FROM measurements m
       JOIN step_runs sr ON sr.id = m.step_run_id
       JOIN units u ON u.id = sr.unit_id
      WHERE u.lot_id = :lotId AND m.check_id IN (:checkIds) AND m.value_number IS NOT NULL
      ORDER BY sr.finished_at, u.serial, m.step_run_id`,
    { replacements: { lotId, checkIds } },
  )
}

/** One series of a winding from the board's chart of that basis; null without the chart. */
function seriesOf(w: WindingTurnsDto, chart: TurnChartDto | null): TurnSeries | null {
  if (!chart) return null
  const basis = chart.basis
  // chart.values index the winding's runs in build order; the points are those values.
  const position = new Map(chart.values.map((v, k) => [v.index, k]))
  const points = chart.values.map(({ index, value }): TurnPoint => {
    const r = w.runs[index]!
    return {
      serial: r.serial,
      station: r.stationCode,
      operator: r.operatorName,
      finishedAt: r.finishedAt,
      estimatedTurns: w.nominalTurns + value,
      deviation: value,
      miscount: r.suspectBy.includes(basis),
    }
  })
  return {
    winding: w.name,
    nominalTurns: w.nominalTurns,
    method: basis,
    lotOffsetPercent: basis === 'median' ? w.lotOffsetPercent : null,
    points,
    chart: { center: chart.center, ucl: chart.ucl, lcl: chart.lcl },
    violations: chart.violations.flatMap((v) => {
      const k = position.get(v.index)
      return k === undefined ? [] : [{ ...v, index: k }]
    }),
    verdict: null,
  }
}

/**
 * The lot's turn-count deviation series for the report, mapped from `lotTurnDeviation()` so the
 * report and the Yield board show the same suspects, run-rule points and verdict. Per winding:
 * the ratio-test series, then the inductance-against-lot-median series, each when the board has
 * that chart; a winding with neither gets one empty series ("no readings yet").
 */
export async function lotTurnDeviationSeries(lotId: string): Promise<TurnSeries[]> {
  const turns = await lotTurnDeviation(lotId)
  return turns.windings.flatMap((w) => {
    const series = [seriesOf(w, w.ratioChart), seriesOf(w, w.medianChart)].filter(
      (x): x is TurnSeries => x !== null,
    )
    if (!series.length)
      series.push({
        winding: w.name,
        nominalTurns: w.nominalTurns,
        method: w.ratioCheckKey ? 'ratio' : 'median',
        lotOffsetPercent: null,
        points: [],
        chart: null,
        violations: [],
        verdict: null,
      })
    series[0]!.verdict = { value: w.verdict, summary: w.summary }
    return series
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
  const rows = await select<{ code: string | null; description: string | null; n: string }>(
    `SELECT dc.code, dc.description, count(*) AS n
       FROM nonconformances nc
       JOIN units u ON u.id = nc.unit_id
       LEFT JOIN defect_codes dc ON dc.id = nc.defect_code_id
      WHERE u.lot_id = :lotId
      GROUP BY dc.code, dc.description
      ORDER BY count(*) DESC, dc.code NULLS LAST`,
    { replacements: { lotId } },
  )
  return rows.map((r) => ({
    code: r.code ?? 'none',
    description: r.description ?? 'no defect code given',
    count: Number(r.n),
  }))
}

async function latestActivity(lotId: string): Promise<Date | null> {
  const [row] = await select<{ at: Date | null }>(
    `SELECT greatest(
              (SELECT max(sr.finished_at) FROM step_runs sr JOIN units u ON u.id = sr.unit_id
                WHERE u.lot_id = :lotId),
              (SELECT max(nc.closed_at) FROM nonconformances nc JOIN units u ON u.id = nc.unit_id
                WHERE u.lot_id = :lotId)) AS at`,
    { replacements: { lotId } },
  )
  return row?.at ? new Date(row.at) : null
}

/** Gathers the lot report's figures; 404 for an unknown lot. */
export async function loadLotReportData(lotId: string): Promise<LotReportData> {
  const lot = await Lot.findByPk(lotId)
  if (!lot) throw AppError.notFound(`lot ${lotId}`)
  const rev = toRevisionDto(await loadRevision(lot.revisionId))
  const [y, totals, pareto, turnSeries, caps, keyChecks, ncs, latest] = await Promise.all([
    getLotYield(lotId),
    lotUnitTotals([lotId]),
    defectPareto(lotId),
    lotTurnDeviationSeries(lotId),
    checkCapabilities(lotId, rev),
    lotKeyCheckSeries(lotId),
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
    keyChecks,
    nonconformances: ncs,
  }
}
