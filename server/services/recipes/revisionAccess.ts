import type { Model, ModelStatic, Transaction } from 'sequelize'
import { can } from '../../../shared/permissions'
import type { Role } from '../../../shared/roles'
import { AppError } from '../../errors'
import { findOr404 } from '../admin'
import { BomLine, Check, Part, Product, Revision, RouteStep, User, Winding } from '../../models'

/** The include that loads a revision with its whole recipe. */
export const FULL_REVISION = [
  { model: Product, as: 'product' },
  { model: User, as: 'releaser', attributes: ['name'] },
  { model: Revision, as: 'copiedFrom', attributes: ['id', 'letter'] },
  { model: Winding, as: 'windings' },
  { model: RouteStep, as: 'steps', include: [{ model: Check, as: 'checks' }] },
  { model: BomLine, as: 'bomLines', include: [{ model: Part, as: 'part' }] },
]

/** A revision with its whole recipe, or a 404. */
export async function loadRevision(id: string, transaction?: Transaction): Promise<Revision> {
  const rev = await Revision.findByPk(id, { include: FULL_REVISION, transaction })
  if (!rev) throw AppError.notFound(`revision ${id}`)
  return rev
}

/**
 * A 404 unless the revision exists and `role` may read it: drafts only for the roles of
 * `readDraftRecipes`, the same answer as for a revision that does not exist.
 */
export async function assertRevisionReadable(id: string, role: Role): Promise<void> {
  const rev = await Revision.findByPk(id, { attributes: ['id', 'status'] })
  if (!rev || (rev.status === 'draft' && !can(role, 'readDraftRecipes')))
    throw AppError.notFound(`revision ${id}`)
}

/**
 * Locks a revision row for the rest of the transaction and refuses with 409 unless it is a
 * draft. Every change to a recipe goes through here, so a release cannot slip in between the
 * check and the write, and a released revision stays exactly as it was built to.
 */
export async function lockDraftRevision(id: string, transaction: Transaction): Promise<Revision> {
  const rev = await Revision.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!rev) throw AppError.notFound(`revision ${id}`)
  if (rev.status !== 'draft')
    throw AppError.conflict(
      'revision_frozen',
      `revision ${rev.letter} is ${rev.status} and frozen: make a new revision from it to change anything`,
    )
  return rev
}

/** A piece of a recipe (a step, check, winding or BOM line), its draft revision locked; or a 404. */
export async function editableRecipePiece<M extends Model & { revisionId: string }>(
  model: ModelStatic<M>,
  id: string,
  what: string,
  transaction: Transaction,
): Promise<M> {
  const piece = await findOr404(model, id, what, transaction)
  await lockDraftRevision(piece.revisionId, transaction)
  return piece
}
