import { pChart } from '../../../shared/quality/spc'
import type {
  LotDailyFailuresDto,
  LotYieldDetailDto,
  ParetoBarDto,
  StationWipDto,
} from '../../../shared/schemas/yield'
import type { StationKind } from '../../../shared/stations'
import { AppError } from '../../errors'
import { Lot } from '../../models'
import { lotStepTotals } from './yieldQueries'
import { select } from '../../db/sql'

// The Yield board's lot detail beyond the step FPYs of `getLotYield`: the Pareto of defect
// codes, WIP per station and the p-chart of daily first-pass failures. Every figure is a SQL
// aggregate (one row per defect code, per day, per station kind), never a row per step run.

interface ParetoRow {
  defect_code_id: string | null
  code: string | null
  description: string | null
  count: string
}

/** Failed step runs of the lot per defect code, most frequent first, with the cumulative share. */
export async function lotPareto(lotId: string): Promise<ParetoBarDto[]> {
  const rows = await select<ParetoRow>(
    `SELECT dc.id AS defect_code_id, dc.code, dc.description, count(*) AS count
       FROM units u
       JOIN step_runs sr ON sr.unit_id = u.id AND sr.result = 'fail'
       LEFT JOIN nonconformances nc ON nc.step_run_id = sr.id
       LEFT JOIN defect_codes dc ON dc.id = nc.defect_code_id
      WHERE u.lot_id = :lotId
      GROUP BY dc.id, dc.code, dc.description
      ORDER BY count(*) DESC, dc.code NULLS LAST`,
    { replacements: { lotId } },
  )
  const total = rows.reduce((n, r) => n + Number(r.count), 0)
  let running = 0
  return rows.map((r) => {
    running += Number(r.count)
    return {
      defectCodeId: r.defect_code_id,
      code: r.code ?? 'none',
      description: r.description ?? 'Failed without a defect code',
      count: Number(r.count),
      cumulative: running / total,
    }
  })
}

/** First attempts and failed first attempts of the lot per UTC day, with p-chart limits. */
export async function lotDailyFailures(lotId: string): Promise<LotDailyFailuresDto> {
  const rows = await select<{ day: string; first_attempts: string; failed: string }>(
    `SELECT to_char(sr.finished_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS day,
            count(*) AS first_attempts,
            count(*) FILTER (WHERE sr.result = 'fail') AS failed
       FROM units u JOIN step_runs sr ON sr.unit_id = u.id AND sr.attempt = 1
      WHERE u.lot_id = :lotId
      GROUP BY 1 ORDER BY 1`,
    { replacements: { lotId } },
  )
  if (!rows.length) return { lotId, center: null, days: [] }
  const samples = rows.map((r) => ({ defective: Number(r.failed), size: Number(r.first_attempts) }))
  const chart = pChart(samples)
  return {
    lotId,
    center: chart.center,
    days: rows.map((r, i) => ({
      day: r.day,
      firstAttempts: samples[i]!.size,
      failed: samples[i]!.defective,
      ...chart.points[i]!,
    })),
  }
}

/** Units at each route step now, with the codes of the stations of that step's kind. */
export async function lotStationWip(lotId: string): Promise<StationWipDto[]> {
  const [steps, stations] = await Promise.all([
    lotStepTotals([lotId]),
    select<{ kind: StationKind; codes: string[] }>(
      'SELECT kind, array_agg(code ORDER BY code) AS codes FROM stations GROUP BY kind',
      {},
    ),
  ])
  const codes = new Map(stations.map((s) => [s.kind, s.codes]))
  return (steps.get(lotId) ?? []).map((s) => ({
    stepName: s.name,
    stationKind: s.stationKind,
    stationCodes: codes.get(s.stationKind) ?? [],
    units: s.wip,
  }))
}

/** The board's detail of one lot: Pareto, WIP per station and the daily failure p-chart. */
export async function getLotYieldDetail(lotId: string): Promise<LotYieldDetailDto> {
  if (!(await Lot.findByPk(lotId, { attributes: ['id'] }))) throw AppError.notFound(`lot ${lotId}`)
  const [pareto, wip, daily] = await Promise.all([
    lotPareto(lotId),
    lotStationWip(lotId),
    lotDailyFailures(lotId),
  ])
  return { lotId, pareto, wip, daily }
}
