import type { Transaction } from 'sequelize'
import { checkLimitProblems } from '../../../shared/checkRules'
import { CHECK_DOCUMENT_FLAGS, isForCustomersByDefault } from '../../../shared/schemas/recipes'
import type { CheckDto, CheckInput, CheckUpdateInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Check, Revision, RouteStep } from '../../models'
import { auditAction, auditCreated, conflictOnDuplicate, findOr404, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { toCheckDto } from './recipePresenters'
import { editableRecipePiece } from './revisionAccess'
import { withTransaction } from '../../db/sql'

const duplicateKey = conflictOnDuplicate('another check of this revision has this key', {
  key: 'already used in this revision',
})

/**
 * The check, its revision locked. `onlyFlags`: the change touches only the document flags,
 * which steer the lot report and the certificate and never a verdict, so a released revision
 * may still take it (audited like any change); anything else needs a draft.
 */
async function editableCheck(
  checkId: string,
  transaction: Transaction,
  onlyFlags = false,
): Promise<Check> {
  if (!onlyFlags) return editableRecipePiece(Check, checkId, 'check', transaction)
  const check = await findOr404(Check, checkId, 'check', transaction)
  await Revision.findByPk(check.revisionId, { transaction, lock: transaction.LOCK.UPDATE })
  return check
}

const isFlagsOnly = (input: CheckUpdateInput) =>
  Object.entries(input).every(
    ([k, v]) => v === undefined || (CHECK_DOCUMENT_FLAGS as readonly string[]).includes(k),
  )

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
      {
        ...input,
        isKey: input.isKey ?? false,
        isForCustomers: input.isForCustomers ?? isForCustomersByDefault(input),
        stepId,
        revisionId: step.revisionId,
        position,
      },
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
    const check = await editableCheck(checkId, transaction, isFlagsOnly(input))
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
