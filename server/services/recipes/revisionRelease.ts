import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import { releaseBlockers } from '../../../shared/recipes/completeness'
import type { ReleaseCheckDto, ReleasedSiblingDto } from '../../../shared/recipes/releaseCheck'
import { recipeChangeText, summarizeRecipeChanges } from '../../../shared/recipes/revisionChanges'
import type { RecipeChange } from '../../../shared/recipes/revisionChanges'
import type { ReleaseInput, RevisionDto } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Revision } from '../../models'
import { select, withTransaction } from '../../db/sql'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { toRevisionDto } from './recipePresenters'
import { loadRevision, lockDraftRevision } from './revisionAccess'

/** What the draft changes against the revision it was copied from; null when made from nothing. */
async function changesOf(rev: RevisionDto, transaction?: Transaction) {
  if (!rev.copiedFrom) return null
  const base = await Revision.findByPk(rev.copiedFrom.id, { attributes: ['id'], transaction })
  // The source was a draft deleted since: nothing left to compare with.
  if (!base) return null
  return summarizeRecipeChanges(toRevisionDto(await loadRevision(base.id, transaction)), rev)
}

/** The product's other released revisions, with how many lots are built or planned to each. */
async function releasedSiblings(
  rev: RevisionDto,
  transaction?: Transaction,
): Promise<ReleasedSiblingDto[]> {
  const siblings = await Revision.findAll({
    where: { productId: rev.productId, status: 'released', id: { [Op.ne]: rev.id } },
    attributes: ['id', 'letter'],
    order: [['letter', 'ASC']],
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  })
  if (siblings.length === 0) return []
  const rows = await select<{ revision_id: string; is_planned: boolean; n: string }>(
    `SELECT revision_id, status = 'planned' AS is_planned, count(*) AS n FROM lots
      WHERE revision_id IN (:ids) AND status <> 'closed' GROUP BY 1, 2`,
    { replacements: { ids: siblings.map((s) => s.id) }, transaction },
  )
  const count = (id: string, isPlanned: boolean) =>
    Number(rows.find((r) => r.revision_id === id && r.is_planned === isPlanned)?.n ?? 0)
  return siblings.map((s) => ({
    id: s.id,
    letter: s.letter,
    openLots: count(s.id, false),
    plannedLots: count(s.id, true),
  }))
}

/**
 * What the release confirmation shows: what stops the release (each blocker naming its record),
 * what the draft changes against the revision it was copied from, and the product's released
 * revisions the release would make obsolete.
 */
export async function releaseCheck(id: string): Promise<ReleaseCheckDto> {
  const rev = toRevisionDto(await loadRevision(id))
  const blockers = releaseBlockers(rev)
  return {
    problems: blockers.map((b) => b.message),
    blockers,
    changes: rev.status === 'draft' ? await changesOf(rev) : null,
    copiedFrom: rev.copiedFrom,
    released: rev.status === 'draft' ? await releasedSiblings(rev) : [],
  }
}

/** A change line as kept in the audit row: the words and where it points, without ids. */
const auditChange = (c: RecipeChange) => ({ area: c.area, kind: c.kind, text: recipeChangeText(c) })

/**
 * Releases a complete draft: from now on it is frozen. The product's other released revisions
 * become obsolete (`previous: 'obsolete'`), so a new lot is offered one revision of the product;
 * lots already released or in progress go on with theirs, as the floor reads the lot's revision
 * and its limits. `previous: 'keep'` leaves them released, for two variants built side by side.
 * The release's audit row keeps the change summary against the revision it was copied from.
 */
export async function releaseRevision(
  id: string,
  actor: Actor,
  input: ReleaseInput = { previous: 'keep' },
): Promise<RevisionDto> {
  return withTransaction(async (transaction) => {
    const rev = await lockDraftRevision(id, transaction)
    const draft = toRevisionDto(await loadRevision(id, transaction))
    const problems = releaseBlockers(draft).map((b) => b.message)
    if (problems.length)
      throw new AppError(
        409,
        'revision_incomplete',
        `revision ${rev.letter} is not complete: ${problems[0]}`,
        undefined,
        problems,
      )
    const changes = await changesOf(draft, transaction)
    const siblings = await releasedSiblings(draft, transaction)
    const retired = input.previous === 'obsolete' ? siblings : []
    await rev.update(
      { status: 'released', releasedAt: new Date(), releasedBy: actor.id },
      { transaction },
    )
    for (const s of retired) {
      await Revision.update({ status: 'obsolete' }, { where: { id: s.id }, transaction })
      await auditAction(
        actor,
        'revision.obsolete',
        s.id,
        {
          before: { status: 'released' },
          after: { status: 'obsolete', replacedBy: rev.letter, openLots: s.openLots },
        },
        transaction,
      )
    }
    await auditAction(
      actor,
      'revision.release',
      id,
      {
        before: { status: 'draft' },
        after: {
          status: 'released',
          copiedFrom: draft.copiedFrom?.letter ?? null,
          changes: changes?.map(auditChange) ?? null,
          obsoleted: retired.map((s) => s.letter),
          keptReleased: siblings.filter((s) => !retired.includes(s)).map((s) => s.letter),
        },
      },
      transaction,
    )
    return toRevisionDto(await loadRevision(id, transaction))
  })
}
