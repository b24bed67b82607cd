import type { Transaction } from 'sequelize'
import type { StepDto, StepInput, StepUpdateInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Check, RouteStep } from '../../models'
import { auditAction, changedFields } from '../admin'
import type { Actor } from '../admin'
import { toStepDto } from './recipePresenters'
import { editableRecipePiece, lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

async function stepsOf(revisionId: string, transaction: Transaction): Promise<RouteStep[]> {
  return RouteStep.findAll({
    where: { revisionId },
    include: [{ model: Check, as: 'checks' }],
    order: [['position', 'ASC']],
    transaction,
  })
}

/** Writes positions 1..n in the given order; the unique constraint is checked at commit. */
async function renumber(steps: RouteStep[], transaction: Transaction): Promise<void> {
  for (const [i, step] of steps.entries())
    if (step.position !== i + 1) await step.update({ position: i + 1 }, { transaction })
}

/** Loads a step and locks its revision as an editable draft. */
function editableStep(stepId: string, transaction: Transaction): Promise<RouteStep> {
  return editableRecipePiece(RouteStep, stepId, 'step', transaction)
}

/** Appends a step to the end of a draft's route. */
export async function createStep(
  revisionId: string,
  input: StepInput,
  actor: Actor,
): Promise<StepDto> {
  return withTransaction(async (transaction) => {
    await lockDraftRevision(revisionId, transaction)
    const position = (await RouteStep.count({ where: { revisionId }, transaction })) + 1
    const step = await RouteStep.create({ ...input, revisionId, position }, { transaction })
    const dto = toStepDto(step, [])
    const after = { revisionId, ...dto }
    await auditAction(actor, 'step.create', step.id, { after }, transaction, 'route_step')
    return dto
  })
}

/** Changes a step; a new `position` moves it and renumbers the others densely. */
export async function updateStep(
  stepId: string,
  input: StepUpdateInput,
  actor: Actor,
): Promise<StepDto> {
  return withTransaction(async (transaction) => {
    const step = await editableStep(stepId, transaction)
    const before = toStepDto(step, [])
    const { position, ...fields } = input
    await step.update(fields, { transaction })
    if (position !== undefined) {
      const steps = (await stepsOf(step.revisionId, transaction)).filter((s) => s.id !== step.id)
      steps.splice(Math.min(position, steps.length + 1) - 1, 0, step)
      await renumber(steps, transaction)
    }
    const fresh = await RouteStep.findByPk(stepId, {
      include: [{ model: Check, as: 'checks' }],
      transaction,
    })
    const after = toStepDto(fresh!)
    const change = changedFields({ ...before, checks: [] }, { ...after, checks: [] })
    await auditAction(actor, 'step.update', stepId, change, transaction, 'route_step')
    return after
  })
}

/** Removes a step with its checks and closes the gap in the positions. */
export async function deleteStep(stepId: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const step = await editableStep(stepId, transaction)
    const before = toStepDto(step, await Check.findAll({ where: { stepId }, transaction }))
    await step.destroy({ transaction })
    await renumber(await stepsOf(step.revisionId, transaction), transaction)
    await auditAction(actor, 'step.delete', stepId, { before }, transaction, 'route_step')
  })
}

/** Puts the route in the given order; the list must name every step of the revision once. */
export async function reorderSteps(
  revisionId: string,
  stepIds: string[],
  actor: Actor,
): Promise<StepDto[]> {
  return withTransaction(async (transaction) => {
    await lockDraftRevision(revisionId, transaction)
    const steps = await stepsOf(revisionId, transaction)
    const byId = new Map(steps.map((s) => [s.id, s]))
    if (
      stepIds.length !== steps.length ||
      new Set(stepIds).size !== stepIds.length ||
      !stepIds.every((id) => byId.has(id))
    )
      throw AppError.badRequest('stepIds: list every step of this revision exactly once', {
        stepIds: 'list every step once',
      })
    const before = steps.map((s) => s.id)
    const ordered = stepIds.map((id) => byId.get(id)!)
    await renumber(ordered, transaction)
    const change = { before: { order: before }, after: { order: stepIds } }
    await auditAction(actor, 'step.reorder', revisionId, change, transaction, 'revision')
    return ordered.map((s) => toStepDto(s))
  })
}
