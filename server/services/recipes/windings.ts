import type { WindingDto, WindingInput } from '../../../shared/schemas/recipes'
import { Winding } from '../../models'
import { auditAction, conflictOnDuplicate, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { toWindingDto } from './recipePresenters'
import { editableRecipePiece, lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

const duplicateName = conflictOnDuplicate('this revision already has a winding with this name', {
  name: 'already used',
})

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
    await auditAction(
      actor,
      'winding.create',
      winding.id,
      { after: { revisionId, ...dto } },
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
    const winding = await editableRecipePiece(Winding, id, 'winding', transaction)
    return updateAudited(actor, 'winding.update', winding, input, toWindingDto, transaction)
  }).catch(duplicateName)
}

/** Removes a winding; checks that derived from it will be named by the release check. */
export async function deleteWinding(id: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const winding = await editableRecipePiece(Winding, id, 'winding', transaction)
    const before = toWindingDto(winding)
    await winding.destroy({ transaction })
    await auditAction(actor, 'winding.delete', id, { before }, transaction)
  })
}
