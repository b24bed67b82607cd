import { checkLimitProblems } from '../../../shared/checkRules'
import type { CheckDto, CheckInput, CheckUpdateInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Check, RouteStep } from '../../models'
import { auditAction, auditCreated, conflictOnDuplicate, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { toCheckDto } from './recipePresenters'
import { editableRecipePiece } from './revisionAccess'
import { withTransaction } from '../../db/sql'

const duplicateKey = conflictOnDuplicate('another check of this revision has this key', {
  key: 'already used in this revision',
})

/** Adds a check at the end of a step's list. */
export async function createCheck(
  stepId: string,
  input: CheckInput,
  actor: Actor,
): Promise<CheckDto> {
  return withTransaction(async (transaction) => {
    const step = await editableRecipePiece(RouteStep, stepId, 'step', transaction)
    const position = (await Check.count({ where: { stepId }, transaction })) + 1
    const check = await Check.create(
      { ...input, stepId, revisionId: step.revisionId, position },
      { transaction },
    )
    return auditCreated(actor, 'check.create', check.id, toCheckDto(check), transaction)
  }).catch(duplicateKey)
}

/** Changes a check; the limits are validated on the merged record, naming the field. */
export async function updateCheck(
  checkId: string,
  input: CheckUpdateInput,
  actor: Actor,
): Promise<CheckDto> {
  return withTransaction(async (transaction) => {
    const check = await editableRecipePiece(Check, checkId, 'check', transaction)
    const problems = checkLimitProblems({ ...toCheckDto(check), ...input })
    if (problems.length)
      throw AppError.badRequest(
        `${problems[0]!.field}: ${problems[0]!.message}`,
        Object.fromEntries(problems.map((p) => [p.field, p.message])),
      )
    return updateAudited(actor, 'check.update', check, input, toCheckDto, transaction)
  }).catch(duplicateKey)
}

/** Removes a check and closes the gap in its step's positions. */
export async function deleteCheck(checkId: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const check = await editableRecipePiece(Check, checkId, 'check', transaction)
    const before = toCheckDto(check)
    await check.destroy({ transaction })
    const rest = await Check.findAll({
      where: { stepId: check.stepId },
      order: [['position', 'ASC']],
      transaction,
    })
    for (const [i, c] of rest.entries())
      if (c.position !== i + 1) await c.update({ position: i + 1 }, { transaction })
    await auditAction(actor, 'check.delete', checkId, { before }, transaction)
  })
}
