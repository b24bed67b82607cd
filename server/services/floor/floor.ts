import { OPEN_UNIT_STATES } from '../../../shared/lots'
import type { UnitState } from '../../../shared/lots'
import type {
  FloorComponentLotDto,
  FloorUnitDto,
  RecentRunDto,
  UnitWhereDto,
  WaitingUnitsDto,
} from '../../../shared/schemas/lots'
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

/** How many units the waiting list shows at most; the count says how many more there are. */
const WAITING_LIMIT = 30

/**
 * Units whose next step is worked at a station of this one's kind, oldest first (since their
 * last step run, or their lot's release): this lot's and others', so the operator sees the queue.
 * Units on hold, or of a lot on hold, are left out: they cannot be worked here. `lotId` narrows
 * the list to one lot.
 */
export async function waitingUnits(
  stationCode: string,
  lotId: string | null = null,
): Promise<WaitingUnitsDto> {
  const station = await stationByCode(stationCode)
  const rows = await select<{
    serial: string
    lot_id: string
    lot_number: string
    product_code: string
    step_name: string
    state: UnitState
    since: Date
    total: string
  }>(
    `SELECT u.serial, l.id AS lot_id, l.number AS lot_number, p.code AS product_code,
            s.name AS step_name, u.state,
            COALESCE((SELECT max(sr.finished_at) FROM step_runs sr WHERE sr.unit_id = u.id),
                     l.released_at, u.created_at) AS since,
            count(*) OVER () AS total
       FROM units u
       JOIN route_steps s ON s.id = u.current_step_id
       JOIN lots l ON l.id = u.lot_id
       JOIN revisions r ON r.id = l.revision_id
       JOIN products p ON p.id = r.product_id
      WHERE s.station_kind = :kind AND u.state IN (:states) AND NOT l.is_on_hold
        AND (CAST(:lotId AS uuid) IS NULL OR l.id = CAST(:lotId AS uuid))
      ORDER BY since, u.serial
      LIMIT :limit`,
    {
      replacements: { kind: station.kind, states: OPEN_UNIT_STATES, limit: WAITING_LIMIT, lotId },
    },
  )
  return {
    total: Number(rows[0]?.total ?? 0),
    units: rows.map((r) => ({
      serial: r.serial,
      lotId: r.lot_id,
      lotNumber: r.lot_number,
      productCode: r.product_code,
      stepName: r.step_name,
      isRework: r.state === 'in_rework',
      since: new Date(r.since).toISOString(),
    })),
  }
}

/**
 * Where a unit waits: its next step and the active stations that work it, or why it waits
 * nowhere (finished, scrapped, on hold). What a traveler's link tells an operator.
 */
export async function whereUnitWaits(scanned: string): Promise<UnitWhereDto> {
  const unit = await findUnitByScan(scanned)
  const lot = (await Lot.findByPk(unit.lotId))!
  const step = unit.currentStepId ? await stepPlan(unit.currentStepId) : null
  const isOpen = OPEN_UNIT_STATES.includes(unit.state)
  const holdReason =
    unit.state === 'on_hold' ? unit.holdReason : lot.isOnHold ? lot.holdReason : null
  const stations =
    step && isOpen && !lot.isOnHold
      ? await Station.findAll({
          where: { kind: step.stationKind, isActive: true },
          order: [['code', 'ASC']],
        })
      : []
  return {
    serial: unit.serial,
    state: unit.state,
    lotNumber: lot.number,
    stepName: isOpen ? (step?.name ?? null) : null,
    stationKind: isOpen ? (step?.stationKind ?? null) : null,
    holdReason: holdReason || null,
    stations: stations.map((s) => ({ code: s.code, name: s.name })),
  }
}
