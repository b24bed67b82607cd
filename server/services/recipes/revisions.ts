import type { Transaction } from 'sequelize'
import { nextRevisionLetter } from '../../../shared/recipeDefinitions'
import type { RevisionDto, RevisionUpdateInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Product, Revision } from '../../models'
import { auditAction, findOr404, statusMove, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { copyRecipe } from './revisionCopy'
import { toRevisionDto } from './recipePresenters'
import { loadRevision, lockDraftRevision } from './revisionAccess'
import { withTransaction } from '../../db/sql'

/** A revision with its windings, route, checks and bill of materials. */
export async function getRevision(id: string): Promise<RevisionDto> {
  return toRevisionDto(await loadRevision(id))
}

async function nextLetter(productId: string, transaction: Transaction): Promise<string> {
  // Lock the product so two engineers adding a revision at once do not pick the same letter.
  await findOr404(Product, productId, 'product', transaction, true)
  const existing = await Revision.findAll({
    where: { productId },
    attributes: ['letter'],
    transaction,
  })
  return nextRevisionLetter(existing.map((r) => r.letter))
}

/** Adds an empty draft revision with the next letter. */
export async function createRevision(productId: string, actor: Actor): Promise<RevisionDto> {
  return withTransaction(async (transaction) => {
    const letter = await nextLetter(productId, transaction)
    const rev = await Revision.create(
      { productId, letter, copiedFromId: null, releasedAt: null, releasedBy: null },
      { transaction },
    )
    const dto = toRevisionDto(await loadRevision(rev.id, transaction))
    await auditAction(
      actor,
      'revision.create',
      rev.id,
      { after: { productId, letter } },
      transaction,
    )
    return dto
  })
}

/** Changes a draft's notes or first-pass-yield alert threshold. */
export async function updateRevision(
  id: string,
  input: RevisionUpdateInput,
  actor: Actor,
): Promise<RevisionDto> {
  return withTransaction(async (transaction) => {
    const rev = await lockDraftRevision(id, transaction)
    const read = () => ({
      notes: rev.notes,
      fpyThresholdPercent: rev.fpyThresholdPercent,
      workingVolts: rev.workingVolts,
      insulation: rev.insulation,
    })
    await updateAudited(actor, 'revision.update', rev, input, read, transaction)
    return toRevisionDto(await loadRevision(id, transaction))
  })
}

/** Deletes a draft revision and its recipe (a released one is history and stays). */
export async function deleteRevision(id: string, actor: Actor): Promise<void> {
  await withTransaction(async (transaction) => {
    const rev = await lockDraftRevision(id, transaction)
    const dto = toRevisionDto(await loadRevision(id, transaction))
    await rev.destroy({ transaction })
    await auditAction(actor, 'revision.delete', id, { before: dto }, transaction)
  })
}

/** Retires a released revision: no new lot may be made to it. */
export async function obsoleteRevision(id: string, actor: Actor): Promise<RevisionDto> {
  return withTransaction(async (transaction) => {
    const rev = await findOr404(Revision, id, 'revision', transaction, true)
    if (rev.status !== 'released')
      throw AppError.conflict(
        'not_released',
        `revision ${rev.letter} is ${rev.status}: only a released revision can be made obsolete`,
      )
    await rev.update({ status: 'obsolete' }, { transaction })
    const change = statusMove('released', 'obsolete')
    await auditAction(actor, 'revision.obsolete', id, change, transaction)
    return toRevisionDto(await loadRevision(id, transaction))
  })
}

/** "New revision from this one": a draft with the next letter holding a deep copy of the recipe. */
export async function copyRevision(id: string, actor: Actor): Promise<RevisionDto> {
  return withTransaction(async (transaction) => {
    const source = await loadRevision(id, transaction)
    const letter = await nextLetter(source.productId, transaction)
    const copy = await Revision.create(
      {
        productId: source.productId,
        letter,
        notes: source.notes,
        fpyThresholdPercent: source.fpyThresholdPercent,
        workingVolts: source.workingVolts,
        insulation: source.insulation,
        copiedFromId: source.id,
        releasedAt: null,
        releasedBy: null,
      },
      { transaction },
    )
    await copyRecipe(source, copy.id, transaction)
    const after = { from: source.letter, letter }
    await auditAction(actor, 'revision.copy', copy.id, { after }, transaction)
    return toRevisionDto(await loadRevision(copy.id, transaction))
  })
}
