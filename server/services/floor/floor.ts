import type { FloorComponentLotDto, FloorUnitDto, RecentRunDto } from '../../../shared/schemas/lots'
import { componentLotRefusal } from '../../../shared/floor/componentLotRefusal'
import { routeRefusal } from '../../../shared/floor/routeRules'
import { codeFromScan } from '../../../shared/links'
import { AppError } from '../../errors'
import { BomLine, ComponentLot, Lot, Part, Product, Revision, Station } from '../../models'
import { todayIso } from '../receiving'
import { toLotToFit } from './consumptions'
import { stepPlan, toStepDtoOf } from './stepPlans'
import { findUnitByScan } from './stepRuns'
import { unitSummary } from '../units'
import { select } from '../../db/sql'

async function stationByCode(code: string): Promise<Station> {
  const station = await Station.findOne({ where: { code: code.toUpperCase() } })
  if (!station) throw AppError.notFound(`station ${code}`)
  return station
}

/** What the Floor shows after a scan: the unit, and its step here or why it cannot be worked. */
export async function floorUnit(scanned: string, stationCode: string): Promise<FloorUnitDto> {
  const station = await stationByCode(stationCode)
  const unit = await findUnitByScan(scanned)
  const lot = (await Lot.findByPk(unit.lotId, {
    include: [{ model: Revision, as: 'revision', include: [{ model: Product, as: 'product' }] }],
  }))!
  const step = unit.currentStepId ? await stepPlan(unit.currentStepId) : null
  const refusal = routeRefusal(unit, lot, step, station)
  const summary = await unitSummary(unit)
  const header = {
    ...summary,
    lotNumber: lot.number,
    productCode: lot.revision!.product!.code,
    productName: lot.revision!.product!.name,
    revisionLetter: lot.revision!.letter,
    holdReason: unit.holdReason,
  }
  if (refusal || !step)
    return { unit: header, refusal: refusal?.message ?? null, step: null, bom: [], windings: [] }
  const { windings, bom } = step
  const stepDto = toStepDtoOf(step)
  return { unit: header, refusal: null, step: stepDto, bom, windings }
}

/** A scanned component lot as the Floor checks it against a bill-of-materials line. */
export async function floorComponentLot(
  scanned: string,
  bomLineId: string,
): Promise<FloorComponentLotDto> {
  const code = codeFromScan(scanned)
  const lot = await ComponentLot.findOne({
    where: { internalCode: code },
    include: [{ model: Part, as: 'part' }],
  })
  if (!lot)
    throw new AppError(404, 'unknown_component_lot', `no component lot ${code}: check the label`)
  const line = await BomLine.findByPk(bomLineId, { include: [{ model: Part, as: 'part' }] })
  if (!line) throw AppError.notFound(`bill of materials line ${bomLineId}`)
  const today = todayIso()
  return {
    internalCode: lot.internalCode,
    partId: lot.partId,
    partNumber: lot.part?.partNumber ?? '',
    status: lot.status,
    isExpired: lot.expiresOn !== null && lot.expiresOn < today,
    quantityRemaining: lot.quantityRemaining,
    refusal: componentLotRefusal(
      toLotToFit(lot),
      { partId: line.partId, partNumber: line.part?.partNumber ?? '' },
      line.quantity,
      today,
    ),
  }
}

/** The last 20 step runs recorded at a station, newest first. */
export async function recentRuns(stationCode: string): Promise<RecentRunDto[]> {
  const station = await stationByCode(stationCode)
  const rows = await select<{
    id: string
    serial: string
    step_name: string
    result: 'pass' | 'fail'
    attempt: number
    finished_at: Date
    operator_name: string
  }>(
    `SELECT sr.id, u.serial, s.name AS step_name, sr.result, sr.attempt, sr.finished_at, op.name AS operator_name
       FROM step_runs sr JOIN units u ON u.id = sr.unit_id JOIN route_steps s ON s.id = sr.step_id JOIN users op ON op.id = sr.operator_id
      WHERE sr.station_id = :stationId ORDER BY sr.finished_at DESC LIMIT 20`,
    { replacements: { stationId: station.id } },
  )
  return rows.map((r) => ({
    id: r.id,
    serial: r.serial,
    stepName: r.step_name,
    result: r.result,
    attempt: r.attempt,
    finishedAt: new Date(r.finished_at).toISOString(),
    operatorName: r.operator_name,
  }))
}
