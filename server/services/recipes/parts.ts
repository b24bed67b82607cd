import { Op } from 'sequelize'
import type { PartDto, PartInput } from '../../../shared/schemas/recipes'
import type { PageDto, PartQuery } from '../../../shared/schemas/componentLots'
import { Part } from '../../models'
import { AppError } from '../../errors'
import { auditCreated, auditedUpdate, conflictOnDuplicate, findOr404 } from '../admin'
import type { Actor } from '../admin'
import { withTransaction } from '../../db/sql'

export function toPartDto(p: Part): PartDto {
  return {
    id: p.id,
    partNumber: p.partNumber,
    description: p.description,
    unitOfMeasure: p.unitOfMeasure,
    hasExpiry: p.hasExpiry,
    needsInspection: p.needsInspection,
    shelfLifeDays: p.shelfLifeDays,
  }
}

/** A shelf life suggests an expiry date, so it belongs only to a part whose lots expire. */
function checkShelfLife(part: { hasExpiry: boolean; shelfLifeDays: number | null }): void {
  if (part.shelfLifeDays !== null && !part.hasExpiry)
    throw AppError.badRequest('shelfLifeDays: only a part whose lots expire has a shelf life', {
      shelfLifeDays: 'only for a part whose lots expire',
    })
}

const duplicateNumber = conflictOnDuplicate('another part has this part number', {
  partNumber: 'already in use',
})

/** A page of parts, searched by part number or description, sorted on the server. */
export async function listParts(q: PartQuery): Promise<PageDto<PartDto>> {
  const where = q.q
    ? {
        [Op.or]: [
          { partNumber: { [Op.iLike]: `%${q.q}%` } },
          { description: { [Op.iLike]: `%${q.q}%` } },
        ],
      }
    : {}
  const { rows, count } = await Part.findAndCountAll({
    where,
    order: [[q.sort, q.order.toUpperCase()]],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return { rows: rows.map(toPartDto), total: count }
}

/** Adds a part. */
export async function createPart(input: PartInput, actor: Actor): Promise<PartDto> {
  checkShelfLife({ hasExpiry: input.hasExpiry, shelfLifeDays: input.shelfLifeDays ?? null })
  return withTransaction(async (transaction) => {
    const part = await Part.create(input, { transaction })
    return auditCreated(actor, 'part.create', part.id, toPartDto(part), transaction)
  }).catch(duplicateNumber)
}

/**
 * Changes a part's number, description, unit, expiry flag, shelf life or incoming inspection.
 * Turning inspection on or off changes what happens to lots received from then on only.
 */
export async function updatePart(
  id: string,
  input: Partial<PartInput>,
  actor: Actor,
): Promise<PartDto> {
  return withTransaction(async (transaction) => {
    const part = await findOr404(Part, id, 'part', transaction, true)
    return auditedUpdate(
      actor,
      'part.update',
      id,
      transaction,
      () => toPartDto(part),
      () => {
        part.set(input)
        // A part that stops expiring loses its shelf life unless the same request sets one.
        if (input.hasExpiry === false && input.shelfLifeDays === undefined)
          part.shelfLifeDays = null
        checkShelfLife(part)
        return part.save({ transaction })
      },
    )
  }).catch(duplicateNumber)
}
