import type { Transaction } from 'sequelize'
import type { StepRefDto, UnitSummaryDto } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import type { RouteStep, Unit } from '../../models'
import { RouteStep as RouteStepModel } from '../../models'

// Where a step run moves a unit is decided in shared/floor/unitAfterRun.ts (pure, with the rest
// of the scan's decision); the moves here are the lead's and the service desk's.
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
