import type { Transaction } from 'sequelize'
import type { UnitState } from '../../shared/lots'
import type { StepRefDto, UnitSummaryDto } from '../../shared/schemas/lots'
import { AppError } from '../errors'
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
 * The step a rework starts at: one of the revision's route at or before `maxPosition`, or a 400
 * naming `reworkToStepId`.
 */
export async function reworkTarget(
  stepId: string | null,
  revisionId: string,
  maxPosition: number,
  transaction: Transaction,
  message = 'choose a step at or before the failed one',
): Promise<RouteStep> {
  const target = stepId ? await RouteStepModel.findByPk(stepId, { transaction }) : null
  if (!target || target.revisionId !== revisionId || target.position > maxPosition)
    throw AppError.badRequest(`reworkToStepId: ${message}`, { reworkToStepId: message })
  return target
}

/**
 * Sends a unit back to `target` to be built and tested again: it is `in_rework` until it passes
 * the step at `untilPosition` again, its rework count goes up, and any hold ends. Used by a
 * nonconformance's rework disposition and by a service case's repair.
 */
export async function sendToRework(
  unit: Unit,
  target: RouteStep,
  untilPosition: number,
  transaction: Transaction,
): Promise<void> {
  await unit.update(
    {
      state: 'in_rework',
      currentStepId: target.id,
      reworkCount: unit.reworkCount + 1,
      reworkUntilPosition: untilPosition,
      finishedAt: null,
      holdKind: null,
      heldFromState: null,
      holdReason: '',
    },
    { transaction },
  )
}

/** Ends a unit's route for good: scrapped, off its step, any hold ended. */
export async function scrapUnit(unit: Unit, transaction: Transaction): Promise<void> {
  await unit.update(
    {
      state: 'scrapped',
      currentStepId: null,
      finishedAt: new Date(),
      holdKind: null,
      heldFromState: null,
      holdReason: '',
    },
    { transaction },
  )
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
