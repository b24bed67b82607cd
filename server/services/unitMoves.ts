import type { Transaction } from 'sequelize'
import type { UnitState } from '../../shared/lots'
import type { StepRefDto, UnitSummaryDto } from '../../shared/schemas/lots'
import type { RouteStep, Unit } from '../models'
import type { StepPlan } from './stepPlans'
import { RouteStep as RouteStepModel } from '../models'

/** The summary of a unit the Floor and the lot page show. */
export async function unitSummary(
  unit: Pick<Unit, 'serial' | 'state' | 'reworkCount' | 'currentStepId'>,
  transaction?: Transaction,
  /** The unit's current step when the caller has it already, saving a query. */
  known?: StepRefDto | null,
): Promise<UnitSummaryDto> {
  const step =
    known !== undefined
      ? known
      : unit.currentStepId
        ? await RouteStepModel.findByPk(unit.currentStepId, { transaction })
        : null
  return {
    serial: unit.serial,
    state: unit.state,
    currentStep: step
      ? { id: step.id, name: step.name, stationKind: step.stationKind, position: step.position }
      : null,
    reworkCount: unit.reworkCount,
  }
}

/** The step after `position` in a revision's route, or null at the end. */
export async function stepAfter(
  revisionId: string,
  position: number,
  transaction: Transaction,
): Promise<RouteStep | null> {
  return RouteStepModel.findOne({ where: { revisionId, position: position + 1 }, transaction })
}

/** The fields of a unit that a step run decides. */
export interface UnitMove {
  state: UnitState
  currentStepId: string | null
  reworkUntilPosition: number | null
  finishedAt: Date | null
  holdKind: Unit['holdKind']
  heldFromState: UnitState | null
  holdReason: string
}

/**
 * Where a unit goes after a step run. A pass goes to the next step (or ends the route as
 * passed) and ends a rework once the failed step is passed again; a fail holds the unit for
 * the lead, who disposes the nonconformance it opens.
 */
export function unitAfterRun(
  unit: Pick<
    Unit,
    | 'state'
    | 'currentStepId'
    | 'reworkUntilPosition'
    | 'finishedAt'
    | 'holdKind'
    | 'heldFromState'
    | 'holdReason'
  >,
  step: Pick<StepPlan, 'name' | 'position' | 'next'>,
  failedKeys: readonly string[],
  at: Date,
): UnitMove {
  const kept = {
    currentStepId: unit.currentStepId,
    reworkUntilPosition: unit.reworkUntilPosition,
    finishedAt: unit.finishedAt,
    holdKind: unit.holdKind,
    heldFromState: unit.heldFromState,
    holdReason: unit.holdReason,
  }
  if (failedKeys.length > 0)
    return {
      ...kept,
      state: 'on_hold',
      holdKind: 'nonconformance',
      heldFromState: unit.state,
      holdReason: `failed ${step.name} (${failedKeys.join(', ')})`,
    }
  const next = step.next
  const isReworkDone =
    unit.state === 'in_rework' && (unit.reworkUntilPosition ?? 0) <= step.position
  const state: UnitState = !next
    ? 'passed'
    : unit.state === 'in_rework' && !isReworkDone
      ? 'in_rework'
      : 'in_progress'
  return {
    ...kept,
    state,
    currentStepId: next?.id ?? null,
    reworkUntilPosition: state === 'in_rework' ? unit.reworkUntilPosition : null,
    finishedAt: next ? null : at,
  }
}
