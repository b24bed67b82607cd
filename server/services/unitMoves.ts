import type { Transaction } from 'sequelize'
import type { StepRefDto, StepRunInput, UnitSummaryDto } from '../../shared/schemas/lots'
import { AppError } from '../errors'
import type { Lot, RouteStep, StepRun, Unit } from '../models'
import type { StepPlan } from './stepPlans'
import { Nonconformance, RouteStep as RouteStepModel } from '../models'
import type { Actor } from './audit'

/** The summary of a unit the Floor and the lot page show. */
export async function unitSummary(
  unit: Unit,
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

/**
 * Moves a unit after a step run. A pass goes to the next step (or ends the route as passed)
 * and ends a rework once the failed step is passed again; a fail opens a nonconformance and
 * holds the unit for the lead. The first run of a lot marks the lot in progress.
 */
export async function moveUnitOn(
  unit: Unit,
  lot: Lot,
  step: StepPlan,
  run: StepRun,
  failedKeys: string[],
  input: StepRunInput,
  actor: Actor,
  transaction: Transaction,
): Promise<Nonconformance | null> {
  if (lot.status === 'released') await lot.update({ status: 'in_progress' }, { transaction })
  if (run.result === 'fail') {
    const nc = await Nonconformance.create(
      {
        unitId: unit.id,
        stepRunId: run.id,
        defectCodeId: input.defectCodeId,
        description: input.note,
        failedChecks: failedKeys,
        disposition: null,
        reworkToStepId: null,
        openedBy: actor.id,
        decidedBy: null,
        countersignedBy: null,
        openedAt: run.finishedAt,
        closedAt: null,
      },
      { transaction },
    )
    await unit.update(
      {
        state: 'on_hold',
        holdKind: 'nonconformance',
        heldFromState: unit.state,
        holdReason: `failed ${step.name} (${failedKeys.join(', ')})`,
      },
      { transaction },
    )
    return nc
  }
  const next = step.next
  const isReworkDone =
    unit.state === 'in_rework' && (unit.reworkUntilPosition ?? 0) <= step.position
  const state = !next
    ? 'passed'
    : unit.state === 'in_rework' && !isReworkDone
      ? 'in_rework'
      : 'in_progress'
  await unit.update(
    {
      state,
      currentStepId: next?.id ?? null,
      reworkUntilPosition: state === 'in_rework' ? unit.reworkUntilPosition : null,
      finishedAt: next ? null : run.finishedAt,
    },
    { transaction },
  )
  return null
}
