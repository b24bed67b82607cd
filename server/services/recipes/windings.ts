import { UniqueConstraintError } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { WindingDto, WindingInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Winding } from '../../models'
import { changedFields, recordAudit } from '../admin'
import type { Actor } from '../admin'
import { toWindingDto } from './recipePresenters'
import { lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

function duplicateName(err: unknown): never {
  if (err instanceof UniqueConstraintError)
    throw AppError.conflict('duplicate', 'this revision already has a winding with this name', {
      name: 'already used',
    })
  throw err
}

async function editableWinding(id: string, transaction: Transaction): Promise<Winding> {
  const winding = await Winding.findByPk(id, { transaction })
  if (!winding) throw AppError.notFound(`winding ${id}`)
  await lockDraftRevision(winding.revisionId, transaction)
  return winding
}

/** Adds a winding's magnetics data to a draft. */
export async function createWinding(
  revisionId: string,
  input: WindingInput,
  actor: Actor,
): Promise<WindingDto> {
  return withTransaction(async (transaction) => {
    await lockDraftRevision(revisionId, transaction)
    const position = (await Winding.count({ where: { revisionId }, transaction })) + 1
    const winding = await Winding.create({ ...input, revisionId, position }, { transaction })
    const dto = toWindingDto(winding)
    await recordAudit(
      actor,
      {
        action: 'winding.create',
        entity: 'winding',
        entityId: winding.id,
        after: { revisionId, ...dto },
      },
      transaction,
    )
    return dto
  }).catch(duplicateName)
}

/** Changes a winding's turns, AL or core area. */
export async function updateWinding(
  id: string,
  input: Partial<WindingInput>,
  actor: Actor,
): Promise<WindingDto> {
  return withTransaction(async (transaction) => {
    const winding = await editableWinding(id, transaction)
    const before = toWindingDto(winding)
    await winding.update(input, { transaction })
    const after = toWindingDto(winding)
    await recordAudit(
      actor,
      {
        action: 'winding.update',
        entity: 'winding',
        entityId: id,
        ...changedFields(before, after),
      },
      transaction,
    )
    return after
  }).catch(duplicateName)
}

/** Removes a winding; checks that derived from it will be named by the release check. */
export async function deleteWinding(id: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const winding = await editableWinding(id, transaction)
    const before = toWindingDto(winding)
    await winding.destroy({ transaction })
    await recordAudit(
      actor,
      { action: 'winding.delete', entity: 'winding', entityId: id, before },
      transaction,
    )
  })
}
