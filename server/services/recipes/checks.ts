import { UniqueConstraintError } from 'sequelize'
import type { Transaction } from 'sequelize'
import { checkLimitProblems } from '../../../shared/checkRules'
import { CHECK_DOCUMENT_FLAGS, isForCustomersByDefault } from '../../../shared/schemas/recipes'
import type { CheckDto, CheckInput, CheckUpdateInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Check, Revision, RouteStep } from '../../models'
import { changedFields, recordAudit } from '../admin'
import type { Actor } from '../admin'
import { toCheckDto } from './recipePresenters'
import { lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

function duplicateKey(err: unknown): never {
  if (err instanceof UniqueConstraintError)
    throw AppError.conflict('duplicate', 'another check of this revision has this key', {
      key: 'already used in this revision',
    })
  throw err
}

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
  const check = await Check.findByPk(checkId, { transaction })
  if (!check) throw AppError.notFound(`check ${checkId}`)
  if (onlyFlags)
    await Revision.findByPk(check.revisionId, { transaction, lock: transaction.LOCK.UPDATE })
  else await lockDraftRevision(check.revisionId, transaction)
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
    const step = await RouteStep.findByPk(stepId, { transaction })
    if (!step) throw AppError.notFound(`step ${stepId}`)
    await lockDraftRevision(step.revisionId, transaction)
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
    const dto = toCheckDto(check)
    await recordAudit(
      actor,
      { action: 'check.create', entity: 'check', entityId: check.id, after: dto },
      transaction,
    )
    return dto
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
    const before = toCheckDto(check)
    const merged = { ...before, ...input }
    const problems = checkLimitProblems(merged)
    if (problems.length)
      throw AppError.badRequest(
        `${problems[0]!.field}: ${problems[0]!.message}`,
        Object.fromEntries(problems.map((p) => [p.field, p.message])),
      )
    await check.update(input, { transaction })
    const after = toCheckDto(check)
    await recordAudit(
      actor,
      {
        action: 'check.update',
        entity: 'check',
        entityId: checkId,
        ...changedFields(before, after),
      },
      transaction,
    )
    return after
  }).catch(duplicateKey)
}

/** Removes a check and closes the gap in its step's positions. */
export async function deleteCheck(checkId: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const check = await editableCheck(checkId, transaction)
    const before = toCheckDto(check)
    await check.destroy({ transaction })
    const rest = await Check.findAll({
      where: { stepId: check.stepId },
      order: [['position', 'ASC']],
      transaction,
    })
    for (const [i, c] of rest.entries())
      if (c.position !== i + 1) await c.update({ position: i + 1 }, { transaction })
    await recordAudit(
      actor,
      { action: 'check.delete', entity: 'check', entityId: checkId, before },
      transaction,
    )
  })
}
