import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import { FINISHED_UNIT_STATES, OPEN_UNIT_STATES } from '../../../shared/lots'
import type { UnitState } from '../../../shared/lots'
import type { z } from 'zod'
import type {
  DocumentDto,
  DocumentRequestInput,
  LotCreateInput,
  LotDto,
  LotUpdateInput,
} from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import { Lot, Product, Revision, RouteStep, Unit } from '../../models'
import { auditAction, auditCreated, auditedUpdate, conflictOnDuplicate } from '../admin'
import type { Actor } from '../admin'
import { lotPrintFilename, requestDocument, toDocumentDto } from '../documents'
import { customerForLot } from '../shipping'
import { allocateSerials } from './serialAllocation'
import { inTransaction, select, withTransaction } from '../../db/sql'

const WITH_PRODUCT = [
  { model: Revision, as: 'revision', include: [{ model: Product, as: 'product' }] },
]

async function unitCounts(lotIds: string[], transaction?: Transaction) {
  const rows = await select<{ lot_id: string; state: UnitState; n: string }>(
    'SELECT lot_id, state, count(*) AS n FROM units WHERE lot_id IN (:lotIds) GROUP BY lot_id, state',
    {
      replacements: { lotIds: lotIds.length ? lotIds : [null] },
      transaction,
    },
  )
  const byLot = new Map<string, Partial<Record<UnitState, number>>>()
  for (const r of rows) byLot.set(r.lot_id, { ...byLot.get(r.lot_id), [r.state]: Number(r.n) })
  return byLot
}

function toLotDto(lot: Lot, counts: Partial<Record<UnitState, number>> = {}): LotDto {
  return {
    id: lot.id,
    number: lot.number,
    revisionId: lot.revisionId,
    revisionLetter: lot.revision?.letter ?? '',
    productId: lot.revision?.product?.id ?? '',
    productCode: lot.revision?.product?.code ?? '',
    productName: lot.revision?.product?.name ?? '',
    quantity: lot.quantity,
    orderRef: lot.orderRef,
    customerName: lot.customerName,
    customerId: lot.customerId ?? null,
    dueDate: lot.dueDate,
    status: lot.status,
    isOnHold: lot.isOnHold,
    holdReason: lot.holdReason,
    releasedAt: lot.releasedAt?.toISOString() ?? null,
    closedAt: lot.closedAt?.toISOString() ?? null,
    createdAt: lot.createdAt.toISOString(),
    counts,
  }
}

/** A lot with its product and unit counts. */
export async function getLot(id: string, transaction?: Transaction): Promise<LotDto> {
  const lot = await Lot.findByPk(id, { include: WITH_PRODUCT, transaction })
  if (!lot) throw AppError.notFound(`lot ${id}`)
  return toLotDto(lot, (await unitCounts([id], transaction)).get(id))
}

/** Every lot, newest first, optionally of one status. */
export async function listLots(filter: { status?: string }): Promise<LotDto[]> {
  const lots = await Lot.findAll({
    where: filter.status ? { status: filter.status } : {},
    include: WITH_PRODUCT,
    order: [['createdAt', 'DESC']],
  })
  const counts = await unitCounts(lots.map((l) => l.id))
  return lots.map((l) => toLotDto(l, counts.get(l.id)))
}

/**
 * Locks a lot row for the rest of the transaction. A lot is locked before any of its units (the
 * scan does the same, stepRuns.ts), so a hold and the first scans of a lot cannot deadlock. NO
 * KEY UPDATE, not UPDATE: a scan's foreign-key check on the lot (KEY SHARE, as it writes
 * lot_run_days) comes after it has its unit, and must not wait for a hold that waits for the unit.
 */
async function lockLot(id: string, transaction: Transaction): Promise<Lot> {
  const lot = await Lot.findByPk(id, { transaction, lock: transaction.LOCK.NO_KEY_UPDATE })
  if (!lot) throw AppError.notFound(`lot ${id}`)
  return lot
}

/** Plans a lot of a released revision; the number is generated unless typed. */
export async function createLot(
  input: Omit<LotCreateInput, 'customerId'> & { customerId?: string | null },
  actor: Actor,
  /** When the lot was planned, if not now: the demo seed's clock. */
  at?: Date,
): Promise<LotDto> {
  return withTransaction(async (transaction) => {
    const rev = await Revision.findByPk(input.revisionId, { transaction })
    if (!rev)
      throw AppError.badRequest('revisionId: no such revision', {
        revisionId: 'no such revision',
      })
    if (rev.status !== 'released')
      throw AppError.badRequest(
        `revisionId: revision ${rev.letter} is ${rev.status}; lots are built to a released revision`,
        {
          revisionId: 'choose a released revision',
        },
      )
    const [seq] = await select<{ n: string }>(`SELECT nextval('lot_number_seq') AS n`, {
      transaction,
    })
    const number = input.number ?? `L-${String(seq!.n).padStart(4, '0')}`
    // A linked customer's name wins over typed text, so the two never disagree.
    const customerName = input.customerId
      ? (await customerForLot(input.customerId, transaction)).name
      : input.customerName
    const lot = await Lot.create(
      {
        ...input,
        customerId: input.customerId ?? null,
        customerName,
        number,
        releasedAt: null,
        closedAt: null,
        createdBy: actor.id,
        ...(at ? { createdAt: at } : {}),
      },
      { transaction },
    )
    const dto = await getLot(lot.id, transaction)
    return auditCreated(actor, 'lot.create', lot.id, dto, transaction, at)
  }).catch(conflictOnDuplicate('another lot has this number', { number: 'already in use' }))
}

/** Changes a lot while it is still planned. */
export async function updateLot(id: string, input: LotUpdateInput, actor: Actor): Promise<LotDto> {
  return withTransaction(async (transaction) => {
    const lot = await lockLot(id, transaction)
    if (lot.status !== 'planned')
      throw AppError.conflict(
        'lot_not_planned',
        `lot ${lot.number} is ${lot.status}: only a planned lot can be changed`,
      )
    if (input.revisionId) {
      const rev = await Revision.findByPk(input.revisionId, { transaction })
      if (rev?.status !== 'released')
        throw AppError.badRequest('revisionId: choose a released revision', {
          revisionId: 'choose a released revision',
        })
    }
    const change = { ...input }
    if (input.customerId)
      change.customerName = (await customerForLot(input.customerId, transaction)).name
    return auditedUpdate(
      actor,
      'lot.update',
      id,
      transaction,
      () => getLot(id, transaction),
      () => lot.update(change, { transaction }),
    )
  })
}

/**
 * Releases a planned lot: allocates its serials, creates the units queued at the route's first
 * step and asks for the travelers and the label sheet, all in one transaction. The lot goes on
 * to `in_progress` with its first step run, in the scan's batched write (`started` in
 * WRITE_RUNS, stepRunSql.ts): a change to the lot's statuses goes there too.
 */
export async function releaseLot(id: string, actor: Actor, now = new Date()): Promise<LotDto> {
  return withTransaction(async (transaction) => {
    const lot = await lockLot(id, transaction)
    if (lot.status !== 'planned')
      throw AppError.conflict('lot_not_planned', `lot ${lot.number} is already ${lot.status}`)
    const rev = await Revision.findByPk(lot.revisionId, {
      include: [{ model: Product, as: 'product' }],
      transaction,
    })
    if (rev?.status !== 'released')
      throw AppError.conflict(
        'revision_not_released',
        `revision ${rev?.letter} is ${rev?.status}: lots are built to a released revision`,
      )
    const first = await RouteStep.findOne({
      where: { revisionId: rev.id },
      order: [['position', 'ASC']],
      transaction,
    })
    const serials = await allocateSerials(rev.product!, lot.quantity, now, transaction)
    await Unit.bulkCreate(
      serials.map((serial) => ({
        serial,
        lotId: lot.id,
        currentStepId: first!.id,
        reworkUntilPosition: null,
        holdKind: null,
        heldFromState: null,
        finishedAt: null,
      })),
      { transaction },
    )
    await lot.update({ status: 'released', releasedAt: now }, { transaction })
    const after = { status: 'released', serials: [serials[0], serials.at(-1)] }
    await auditAction(
      actor,
      'lot.release',
      id,
      { before: { status: 'planned' }, after, at: now },
      transaction,
    )
    await requestDocument(
      { kind: 'travelers', lotId: id, filename: lotPrintFilename(lot.number, 'travelers') },
      actor,
      transaction,
      now,
    )
    await requestDocument(
      {
        kind: 'labels',
        lotId: id,
        layout: 'a4_3x8',
        filename: lotPrintFilename(lot.number, 'labels', 'a4_3x8'),
      },
      actor,
      transaction,
      now,
    )
    return getLot(id, transaction)
  })
}

/** Locks the units `where` selects, in the order of their ids (so two holds cannot deadlock). */
function lockUnits(where: Record<string, unknown>, transaction: Transaction): Promise<Unit[]> {
  return Unit.findAll({ where, order: [['id', 'ASC']], transaction, lock: transaction.LOCK.UPDATE })
}

/**
 * Puts a lot on hold; its open units follow, remembering the state to go back to. The audit row
 * names the units held, as a containment's does.
 */
export async function holdLot(id: string, reason: string, actor: Actor): Promise<LotDto> {
  return inTransaction(async (transaction) => {
    const lot = await lockLot(id, transaction)
    if (lot.isOnHold) throw AppError.conflict('lot_on_hold', `lot ${lot.number} is already on hold`)
    if (lot.status === 'closed')
      throw AppError.conflict('lot_closed', `lot ${lot.number} is closed`)
    await lot.update({ isOnHold: true, holdReason: reason }, { transaction })
    const units = await lockUnits({ lotId: id, state: { [Op.in]: OPEN_UNIT_STATES } }, transaction)
    for (const u of units)
      await u.update(
        {
          heldFromState: u.state,
          state: 'on_hold',
          holdKind: 'lot',
          holdReason: `lot on hold: ${reason}`,
        },
        { transaction },
      )
    return heldOrFreed(actor, 'lot.hold', id, reason, units, transaction)
  })
}

/** Audits a lot's hold put on or lifted, with the units it moved, and returns the lot. */
async function heldOrFreed(
  actor: Actor,
  action: string,
  id: string,
  reason: string,
  units: Unit[],
  transaction: Transaction,
): Promise<LotDto> {
  const after = { reason, units: units.map((u) => u.serial) }
  await auditAction(actor, action, id, { after }, transaction)
  return getLot(id, transaction)
}

/** Lifts a lot's hold; units it held go back to where they were, others stay as they are. */
export async function unholdLot(id: string, reason: string, actor: Actor): Promise<LotDto> {
  return inTransaction(async (transaction) => {
    const lot = await lockLot(id, transaction)
    if (!lot.isOnHold)
      throw AppError.conflict('lot_not_on_hold', `lot ${lot.number} is not on hold`)
    await lot.update({ isOnHold: false, holdReason: '' }, { transaction })
    const units = await lockUnits({ lotId: id, state: 'on_hold', holdKind: 'lot' }, transaction)
    for (const u of units)
      await u.update(
        { state: u.heldFromState ?? 'queued', heldFromState: null, holdKind: null, holdReason: '' },
        { transaction },
      )
    return heldOrFreed(actor, 'lot.unhold', id, reason, units, transaction)
  })
}

/** Closes a lot once every unit has finished its route. */
export async function closeLot(id: string, actor: Actor, at = new Date()): Promise<LotDto> {
  return withTransaction(async (transaction) => {
    const lot = await lockLot(id, transaction)
    if (lot.status === 'planned' || lot.status === 'closed')
      throw AppError.conflict('lot_not_open', `lot ${lot.number} is ${lot.status}`)
    const open = await Unit.count({
      where: { lotId: id, state: { [Op.notIn]: FINISHED_UNIT_STATES } },
      transaction,
    })
    if (open > 0)
      throw AppError.conflict(
        'lot_has_open_units',
        `lot ${lot.number} still has ${open} unit(s) on the floor`,
      )
    await lot.update({ status: 'closed', closedAt: at }, { transaction })
    await auditAction(actor, 'lot.close', id, { after: { status: 'closed' }, at }, transaction)
    return getLot(id, transaction)
  })
}

/**
 * Asks for one of a lot's papers (travelers, labels, the lot report): the document row is made
 * and audited in one transaction, and its rendering is queued once that commits.
 */
export async function requestLotDocument(
  id: string,
  input: z.output<typeof DocumentRequestInput>,
  actor: Actor,
): Promise<DocumentDto> {
  const lot = await getLot(id)
  const doc = await withTransaction((transaction) =>
    requestDocument(
      {
        kind: input.kind,
        lotId: lot.id,
        layout: input.layout,
        filename: lotPrintFilename(lot.number, input.kind, input.layout),
      },
      actor,
      transaction,
    ),
  )
  return toDocumentDto(doc)
}
