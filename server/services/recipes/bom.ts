import type { Transaction } from 'sequelize'
import type { BomLineDto, BomLineInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { BomLine, Part, RouteStep } from '../../models'
import { changedFields, recordAudit } from '../admin'
import type { Actor } from '../admin'
import { toBomLineDto } from './recipePresenters'
import { lockDraftRevision } from './revisionAccess'
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
    await recordAudit(
      actor,
      {
        action: 'bom_line.create',
        entity: 'bom_line',
        entityId: line.id,
        after: { revisionId, ...dto },
      },
      transaction,
    )
    return dto
  })
}

async function editableLine(id: string, transaction: Transaction): Promise<BomLine> {
  const line = await BomLine.findByPk(id, { transaction })
  if (!line) throw AppError.notFound(`bill of materials line ${id}`)
  await lockDraftRevision(line.revisionId, transaction)
  return line
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
    const before = await withPart(line, transaction)
    await line.update(input, { transaction })
    const after = await withPart(line, transaction)
    await recordAudit(
      actor,
      {
        action: 'bom_line.update',
        entity: 'bom_line',
        entityId: id,
        ...changedFields(before, after),
      },
      transaction,
    )
    return after
  })
}

/** Removes a line from a draft's bill of materials. */
export async function deleteBomLine(id: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const line = await editableLine(id, transaction)
    const before = await withPart(line, transaction)
    await line.destroy({ transaction })
    await recordAudit(
      actor,
      { action: 'bom_line.delete', entity: 'bom_line', entityId: id, before },
      transaction,
    )
  })
}
