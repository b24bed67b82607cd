import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../../shared/links'
import type { UnitState } from '../../../shared/lots'
import type { UnitSummaryDto } from '../../../shared/schemas/lots'
import type {
  ContainedUnitDecisionInput,
  ContainedUnitDto,
  EndContainmentInput,
  EndContainmentResultDto,
} from '../../../shared/schemas/trace'
import { AppError } from '../../errors'
import { ComponentLot, Lot, RouteStep, Unit } from '../../models'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { containedUnitIds, moveComponentLotStatus } from '../receiving'
import { verifyCountersign } from '../auth'
import { findComponentLot, recallScope } from '../trace'
import { reworkTarget, scrapUnit, sendToRework, unitSummary } from '../units'
import { select, withTransaction } from '../../db/sql'

// A containment (recall.ts) holds every unit still in the shop that holds a suspect component
// lot and quarantines the lot. It ends when the investigation has an answer: the lot is cleared
// and the units go back to where they stood, or it is rejected and a lead decides each unit.

interface FittedLot {
  code: string
  status: string
  stepId: string
  stepName: string
  position: number
}

/** The component lots fitted in a unit, with the step each was fitted at, in route order. */
async function fittedLots(unitId: string, transaction: Transaction): Promise<FittedLot[]> {
  return select<FittedLot>(
    `SELECT DISTINCT ON (cl.internal_code)
            cl.internal_code AS code, cl.status, rs.id AS "stepId", rs.name AS "stepName",
            rs.position
       FROM consumptions co
       JOIN component_lots cl ON cl.id = co.component_lot_id
       JOIN step_runs sr ON sr.id = co.step_run_id
       JOIN route_steps rs ON rs.id = sr.step_id
      WHERE co.unit_id = :unitId
      ORDER BY cl.internal_code, rs.position`,
    { replacements: { unitId }, transaction },
  )
}

const quarantinedCodes = (fitted: FittedLot[]) =>
  fitted.filter((f) => f.status === 'quarantined').map((f) => f.code)

/** For each unit, the quarantined component lots fitted in it other than `exceptLotId`. */
async function otherQuarantinedLots(
  unitIds: readonly string[],
  exceptLotId: string,
  transaction: Transaction,
): Promise<Map<string, string[]>> {
  if (!unitIds.length) return new Map()
  const rows = await select<{ unit_id: string; codes: string[] }>(
    `SELECT co.unit_id, array_agg(DISTINCT cl.internal_code ORDER BY cl.internal_code) AS codes
       FROM consumptions co JOIN component_lots cl ON cl.id = co.component_lot_id
      WHERE co.unit_id IN (:unitIds) AND cl.status = 'quarantined' AND cl.id <> :exceptLotId
      GROUP BY co.unit_id`,
    { replacements: { unitIds, exceptLotId }, transaction },
  )
  return new Map(rows.map((r) => [r.unit_id, r.codes]))
}

/** Back to where the unit stood when it was held; its step never changed while it was held. */
function releasedFields(unit: Unit) {
  return {
    state: (unit.heldFromState ?? 'queued') as UnitState,
    heldFromState: null,
    holdKind: null,
    holdReason: '',
  }
}

/**
 * Ends the containment of a quarantined component lot in one transaction. Cleared: the lot is
 * available again (used up when none is left) and every unit its containment held goes back to
 * where it stood, unless another quarantined lot is fitted in it. Rejected: the lot is rejected
 * and its held units stay on hold, each waiting for a lead's decision (decideContainedUnit).
 */
export async function endContainment(
  scanned: string,
  input: EndContainmentInput,
  actor: Actor,
): Promise<EndContainmentResultDto> {
  return withTransaction(async (transaction) => {
    const found = await findComponentLot(scanned, transaction)
    const lot = (await ComponentLot.findByPk(found.id, {
      transaction,
      lock: transaction.LOCK.UPDATE,
    }))!
    if (lot.status !== 'quarantined')
      throw AppError.conflict(
        'not_contained',
        `component lot ${lot.internalCode} is ${lot.status.replace('_', ' ')}, not quarantined: there is no containment to end`,
      )
    const units = await Unit.findAll({
      where: { id: await containedUnitIds(lot.id, transaction) },
      order: [['serial', 'ASC']],
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    const isCleared = input.outcome === 'cleared'
    await moveComponentLotStatus(
      lot.id,
      {
        status: isCleared ? 'available' : 'rejected',
        reason: `containment ended (${input.outcome}): ${input.reason}`,
      },
      actor,
      transaction,
    )
    // The system's own rule, as after a stock count: a lot with nothing left is used up.
    if (isCleared && lot.quantityRemaining === 0)
      await ComponentLot.update({ status: 'used_up' }, { where: { id: lot.id }, transaction })

    const othersOf = await otherQuarantinedLots(
      units.map((u) => u.id),
      lot.id,
      transaction,
    )
    const released: string[] = []
    const stillHeld: EndContainmentResultDto['stillHeld'] = []
    for (const unit of units) {
      const others = othersOf.get(unit.id) ?? []
      const before = { state: unit.state, holdReason: unit.holdReason }
      if (isCleared && others.length === 0) {
        await unit.update(releasedFields(unit), { transaction })
        released.push(unit.serial)
      } else {
        const holdReason = (
          isCleared
            ? `still contained: component lot ${others.join(', ')} is quarantined`
            : `component lot ${lot.internalCode} rejected: ${input.reason}; decide this unit`
        ).slice(0, 500)
        await unit.update({ holdReason }, { transaction })
        stillHeld.push({ serial: unit.serial, reason: holdReason })
      }
      await auditAction(
        actor,
        isCleared && others.length === 0 ? 'unit.release' : 'unit.hold_reason',
        unit.id,
        {
          before,
          after: { serial: unit.serial, state: unit.state, holdReason: unit.holdReason },
        },
        transaction,
        'unit',
      )
    }
    await auditAction(
      actor,
      'component_lot.end_containment',
      lot.id,
      {
        before: { status: 'quarantined' },
        after: { outcome: input.outcome, reason: input.reason, released, stillHeld },
      },
      transaction,
    )
    return {
      scope: await recallScope(lot.internalCode, transaction),
      outcome: input.outcome,
      released,
      stillHeld,
    }
  })
}

async function containedUnitOf(
  scanned: string,
  transaction: Transaction,
  lock: boolean,
): Promise<{ unit: Unit; dto: ContainedUnitDto; revisionId: string; maxPosition: number }> {
  const serial = codeFromScan(scanned)
  const unit = await Unit.findOne({
    where: { serial },
    transaction,
    lock: lock ? transaction.LOCK.UPDATE : undefined,
  })
  if (!unit) throw AppError.notFound(`unit ${serial}`)
  if (unit.state !== 'on_hold' || unit.holdKind !== 'containment')
    throw AppError.conflict('not_contained', `${serial} is not held by a containment`)
  const fitted = await fittedLots(unit.id, transaction)
  const rejected = fitted.filter((f) => f.status === 'rejected')
  const { revisionId } = (await Lot.findByPk(unit.lotId, { transaction }))!
  // A rework must start at or before the first step that fitted a rejected part, to replace it.
  const maxPosition = Math.min(...rejected.map((f) => f.position))
  const steps = rejected.length
    ? await RouteStep.findAll({
        where: { revisionId, position: { [Op.lte]: maxPosition } },
        order: [['position', 'ASC']],
        transaction,
      })
    : []
  return {
    unit,
    revisionId,
    maxPosition,
    dto: {
      serial: unit.serial,
      state: unit.state,
      heldFromState: unit.heldFromState,
      holdReason: unit.holdReason,
      stillContainedBy: quarantinedCodes(fitted),
      rejectedLots: rejected.map((f) => ({
        code: f.code,
        fittedAtStep: { id: f.stepId, name: f.stepName, position: f.position },
      })),
      reworkSteps: steps.map((s) => ({ id: s.id, name: s.name, position: s.position })),
    },
  }
}

/** A unit held by a containment, with the decisions open to a lead. */
export async function containedUnit(scanned: string): Promise<ContainedUnitDto> {
  return withTransaction(async (transaction) => {
    return (await containedUnitOf(scanned, transaction, false)).dto
  })
}

/**
 * A lead's decision for a unit held by the containment of a lot that was rejected. Rework sends
 * it back to a step at or before the one that fitted the rejected part; scrap ends it; release
 * keeps the part and sends it on from where it stood, with a written reason and an engineer's
 * signature (as a nonconformance's use as is).
 */
export async function decideContainedUnit(
  scanned: string,
  input: ContainedUnitDecisionInput,
  actor: Actor & { role: string },
): Promise<UnitSummaryDto> {
  return withTransaction(async (transaction) => {
    const { unit, dto, revisionId, maxPosition } = await containedUnitOf(scanned, transaction, true)
    if (dto.stillContainedBy.length)
      throw AppError.conflict(
        'still_contained',
        `${unit.serial} holds component lot ${dto.stillContainedBy.join(', ')}, which is still contained: end that containment first`,
      )
    const before = { state: unit.state, holdReason: unit.holdReason }
    let countersignedBy: string | null = null
    if (input.decision === 'rework') {
      const target = await reworkTarget(
        input.reworkToStepId,
        revisionId,
        maxPosition,
        transaction,
        'choose a step at or before the one that fitted the rejected part',
      )
      // In rework until it is back where it stood: the step before its current one, or the
      // route's last step for a unit that had passed.
      const current = unit.currentStepId
        ? await RouteStep.findByPk(unit.currentStepId, { transaction })
        : null
      const until = current
        ? current.position - 1
        : await RouteStep.max<number, RouteStep>('position', { where: { revisionId }, transaction })
      await sendToRework(unit, target, until, transaction)
    } else if (input.decision === 'scrap') {
      await scrapUnit(unit, transaction)
    } else {
      if (input.reason.length < 10)
        throw AppError.badRequest(
          'reason: say in a sentence why the unit may keep the rejected part',
          { reason: 'write at least 10 characters' },
        )
      if (actor.role !== 'engineer')
        countersignedBy = (
          await verifyCountersign(
            input.countersign,
            actor,
            ['engineer'],
            'releasing a unit with a rejected part',
            transaction,
          )
        ).id
      await unit.update(releasedFields(unit), { transaction })
    }
    await auditAction(
      actor,
      'unit.containment_decision',
      unit.id,
      {
        before,
        after: {
          serial: unit.serial,
          decision: input.decision,
          reworkToStepId: input.decision === 'rework' ? input.reworkToStepId : null,
          reason: input.reason,
          rejectedLots: dto.rejectedLots.map((r) => r.code),
          state: unit.state,
          countersignedBy,
        },
      },
      transaction,
    )
    return unitSummary(unit, transaction)
  })
}
