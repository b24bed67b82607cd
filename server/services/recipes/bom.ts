import type { Transaction } from 'sequelize'
import type { BomLineDto, BomLineInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { BomLine, Part, RouteStep } from '../../models'
import { auditAction, auditedUpdate } from '../admin'
import type { Actor } from '../admin'
import { toBomLineDto } from './recipePresenters'
import { editableRecipePiece, lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

async function withPart(line: BomLine, transaction: Transaction): Promise<BomLineDto> {
  line.part = (await Part.findByPk(line.partId, { transaction })) ?? undefined
  return toBomLineDto(line)
}

/** Refuses a part that does not exist or a fitted-at step of another revision. */
async function checkRefs(
  revisionId: string,
  input: Partial<BomLineInput>,
  transaction: Transaction,
): Promise<void> {
  if (input.partId && !(await Part.findByPk(input.partId, { transaction })))
    throw AppError.badRequest('partId: no such part', { partId: 'no such part' })
  if (input.fittedAtStepId) {
    const step = await RouteStep.findByPk(input.fittedAtStepId, { transaction })
    if (step?.revisionId !== revisionId)
      throw AppError.badRequest('fittedAtStepId: choose a step of this route', {
        fittedAtStepId: 'choose a step of this route',
      })
  }
}

/** A revision's bill of materials in order. */
export async function listBom(revisionId: string): Promise<BomLineDto[]> {
  const lines = await BomLine.findAll({
    where: { revisionId },
    include: [{ model: Part, as: 'part' }],
    order: [['position', 'ASC']],
  })
  return lines.map(toBomLineDto)
}

/** Adds a line to a draft's bill of materials. */
export async function createBomLine(
  revisionId: string,
  input: BomLineInput,
  actor: Actor,
): Promise<BomLineDto> {
  return withTransaction(async (transaction) => {
    await lockDraftRevision(revisionId, transaction)
    await checkRefs(revisionId, input, transaction)
    const position = (await BomLine.count({ where: { revisionId }, transaction })) + 1
    const line = await BomLine.create({ ...input, revisionId, position }, { transaction })
    const dto = await withPart(line, transaction)
    await auditAction(
      actor,
      'bom_line.create',
      line.id,
      { after: { revisionId, ...dto } },
      transaction,
    )
    return dto
  })
}

function editableLine(id: string, transaction: Transaction): Promise<BomLine> {
  return editableRecipePiece(BomLine, id, 'bill of materials line', transaction)
}

/** Changes a line of a draft's bill of materials. */
export async function updateBomLine(
  id: string,
  input: Partial<BomLineInput>,
  actor: Actor,
): Promise<BomLineDto> {
  return withTransaction(async (transaction) => {
    const line = await editableLine(id, transaction)
    await checkRefs(line.revisionId, input, transaction)
    return auditedUpdate(
      actor,
      'bom_line.update',
      id,
      transaction,
      () => withPart(line, transaction),
      () => line.update(input, { transaction }),
    )
  })
}

/** Removes a line from a draft's bill of materials. */
export async function deleteBomLine(id: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const line = await editableLine(id, transaction)
    const before = await withPart(line, transaction)
    await line.destroy({ transaction })
    await auditAction(actor, 'bom_line.delete', id, { before }, transaction)
  })
}
