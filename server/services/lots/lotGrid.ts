import type { GridCell, UnitState } from '../../../shared/lots'
import type { LotGridDto, StepRefDto, UnitSummaryDto } from '../../../shared/schemas/lots'
import type { StationKind } from '../../../shared/stations'
import { AppError } from '../../errors'
import { Lot, RouteStep } from '../../models'
import { select } from '../../db/sql'

function stepRef(s: RouteStep): StepRefDto {
  return { id: s.id, name: s.name, stationKind: s.stationKind, position: s.position }
}

async function lotSteps(lotId: string): Promise<StepRefDto[]> {
  const lot = await Lot.findByPk(lotId)
  if (!lot) throw AppError.notFound(`lot ${lotId}`)
  const steps = await RouteStep.findAll({
    where: { revisionId: lot.revisionId },
    order: [['position', 'ASC']],
  })
  return steps.map(stepRef)
}

/** The units of a lot with their state and the step each waits at. */
export async function listLotUnits(lotId: string): Promise<UnitSummaryDto[]> {
  const steps = await lotSteps(lotId)
  const byId = new Map(steps.map((s) => [s.id, s]))
  const rows = await select<{
    serial: string
    state: UnitState
    current_step_id: string | null
    rework_count: number
  }>(
    'SELECT serial, state, current_step_id, rework_count FROM units WHERE lot_id = :lotId ORDER BY serial',
    { replacements: { lotId } },
  )
  return rows.map((r) => ({
    serial: r.serial,
    state: r.state,
    currentStep: r.current_step_id ? (byId.get(r.current_step_id) ?? null) : null,
    reworkCount: r.rework_count,
  }))
}

interface CellRow {
  serial: string
  state: UnitState
  rework_count: number
  current_step_id: string | null
  step_id: string | null
  runs: string
  first_pass: boolean | null
  last_result: 'pass' | 'fail' | null
}

/**
 * The lot page's unit × step grid and WIP per step, aggregated in SQL: one row per unit and
 * step it has runs at, never every step run loaded into Node.
 */
export async function lotGrid(lotId: string): Promise<LotGridDto> {
  const steps = await lotSteps(lotId)
  const rows = await select<CellRow>(
    `SELECT u.serial, u.state, u.rework_count, u.current_step_id, sr.step_id,
            count(sr.id) AS runs,
            bool_or(sr.attempt = 1 AND sr.result = 'pass') AS first_pass,
            (array_agg(sr.result ORDER BY sr.attempt DESC))[1] AS last_result
       FROM units u LEFT JOIN step_runs sr ON sr.unit_id = u.id
      WHERE u.lot_id = :lotId
      GROUP BY u.id, sr.step_id
      ORDER BY u.serial`,
    { replacements: { lotId } },
  )
  const column = new Map(steps.map((s, i) => [s.id, i]))
  const units = new Map<string, LotGridDto['units'][number]>()
  for (const r of rows) {
    let unit = units.get(r.serial)
    if (!unit) {
      const cells: GridCell[] = steps.map(() => 'not_reached')
      const current = r.current_step_id ? column.get(r.current_step_id) : undefined
      if (current !== undefined && (r.state === 'in_progress' || r.state === 'in_rework'))
        cells[current] = 'in_progress'
      unit = { serial: r.serial, state: r.state, reworkCount: r.rework_count, cells }
      units.set(r.serial, unit)
    }
    const i = r.step_id ? column.get(r.step_id) : undefined
    if (i === undefined || unit.cells[i] === 'in_progress') continue
    if (r.last_result === 'fail') unit.cells[i] = 'failed'
    else if (r.last_result === 'pass')
      unit.cells[i] = r.first_pass && Number(r.runs) === 1 ? 'passed_first' : 'passed_after_rework'
  }
  const wipRows = await select<{ step_id: string; n: string }>(
    `SELECT current_step_id AS step_id, count(*) AS n FROM units
      WHERE lot_id = :lotId AND state IN ('queued', 'in_progress', 'in_rework', 'on_hold') AND current_step_id IS NOT NULL
      GROUP BY current_step_id`,
    { replacements: { lotId } },
  )
  const wipByStep = new Map(wipRows.map((w) => [w.step_id, Number(w.n)]))
  const wip = steps.map((s) => ({
    stationKind: s.stationKind as StationKind,
    stepName: s.name,
    units: wipByStep.get(s.id) ?? 0,
  }))
  return { steps, units: [...units.values()], wip }
}
