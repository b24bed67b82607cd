import { Op } from 'sequelize'
import type { Transaction, WhereOptions } from 'sequelize'
import { mod3736CheckCharacter } from '../../../shared/checkCharacter'
import type { ComponentLotStatus } from '../../../shared/recipeDefinitions'
import { LOT_STATUS_MOVES, suggestedExpiry } from '../../../shared/schemas/componentLots'
import type {
  ComponentLotCreateInput,
  ComponentLotDto,
  ComponentLotInspectionInput,
  ComponentLotQuery,
  ComponentLotStatusInput,
  ComponentLotUpdateInput,
  PageDto,
} from '../../../shared/schemas/componentLots'
import { AppError } from '../../errors'
import { ComponentLot, Part, Supplier, Upload } from '../../models'
import { auditAction, auditCreated, auditedUpdate } from '../admin'
import type { Actor } from '../admin'
import { CERTIFICATE_MAX_BYTES, CERTIFICATE_TYPES, storeUpload, toUploadDto } from './uploads'
import { findOrAddSupplier } from './suppliers'
import { isoTimeOrNull, partFields, pickFields } from '../presenters'
import { select, withTransaction } from '../../db/sql'

/** Today's date as YYYY-MM-DD (UTC), the day against which expiry dates are judged. */
export function todayIso(now = new Date()): string {
  return now.toISOString().slice(0, 10)
}

export function toComponentLotDto(lot: ComponentLot, today = todayIso()): ComponentLotDto {
  return {
    ...pickFields(lot, [
      'id',
      'internalCode',
      'partId',
      'supplierId',
      'supplierLotCode',
      'quantityReceived',
      'quantityRemaining',
      'receivedOn',
      'expiresOn',
      'status',
      'notes',
      'awaitsInspection',
      'inspectionNote',
    ]),
    ...partFields(lot.part),
    supplierName: lot.supplier?.name ?? '',
    isExpired: lot.expiresOn !== null && lot.expiresOn < today,
    certificate: lot.certificate ? toUploadDto(lot.certificate) : null,
    inspectedAt: isoTimeOrNull(lot.inspectedAt),
  }
}

const INCLUDE = [
  { model: Part, as: 'part' },
  { model: Upload, as: 'certificate' },
  { model: Supplier, as: 'supplier' },
]

async function loadLot(id: string, transaction?: Transaction, lock = false): Promise<ComponentLot> {
  // Lock the lot row alone: FOR UPDATE cannot apply to the nullable side of the outer joins.
  if (lock && transaction) {
    const locked = await ComponentLot.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!locked) throw AppError.notFound(`component lot ${id}`)
  }
  const lot = await ComponentLot.findByPk(id, { include: INCLUDE, transaction })
  if (!lot) throw AppError.notFound(`component lot ${id}`)
  return lot
}

/**
 * The next internal lot code, `CL-<YY>-<5 digits><check>`: the number comes from a database
 * sequence (never handed out twice), the check character is ISO/IEC 7064 MOD 37,36.
 */
async function nextInternalCode(receivedOn: string, transaction: Transaction): Promise<string> {
  const [row] = await select<{ n: string }>(`SELECT nextval('component_lot_code_seq') AS n`, {
    transaction,
  })
  const body = `CL-${receivedOn.slice(2, 4)}-${String(row!.n).padStart(5, '0')}`
  return `${body}${mod3736CheckCharacter(body)}`
}

/** A page of component lots, filtered and sorted on the server. */
export async function listComponentLots(q: ComponentLotQuery): Promise<PageDto<ComponentLotDto>> {
  const where: WhereOptions<ComponentLot> = {}
  if (q.partId) where.partId = q.partId
  if (q.status) where.status = q.status
  if (q.q) {
    const like = `%${q.q}%`
    Object.assign(where, {
      [Op.or]: [
        { internalCode: { [Op.iLike]: like } },
        { supplierLotCode: { [Op.iLike]: like } },
        { '$supplier.name$': { [Op.iLike]: like } },
        { '$part.part_number$': { [Op.iLike]: like } },
      ],
    })
  }
  const { rows, count } = await ComponentLot.findAndCountAll({
    where,
    include: INCLUDE,
    // Lots without an expiry date sort after those with one, whichever way the column runs.
    order: [
      [q.sort, `${q.order.toUpperCase()} NULLS LAST`],
      ['internalCode', 'DESC'],
    ],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
    distinct: true,
  })
  const today = todayIso()
  return { rows: rows.map((r) => toComponentLotDto(r, today)), total: count }
}

/** One component lot. */
export async function getComponentLot(id: string): Promise<ComponentLotDto> {
  return toComponentLotDto(await loadLot(id))
}

/**
 * Receives a lot: allocates its internal code and puts the whole quantity in stock. The
 * supplier is found by name whatever its case or spacing, or added (audited). A part that
 * ages needs the expiry date; a lot of a part that needs incoming inspection starts
 * quarantined, awaiting stores' acceptance.
 */
export async function receiveComponentLot(
  input: ComponentLotCreateInput,
  actor: Actor,
): Promise<ComponentLotDto> {
  return withTransaction(async (transaction) => {
    const part = await Part.findByPk(input.partId, { transaction })
    if (!part) throw AppError.badRequest('partId: no such part', { partId: 'no such part' })
    if (input.expiresOn && !part.hasExpiry)
      throw AppError.badRequest('expiresOn: this part has no expiry date', {
        expiresOn: 'this part has no expiry date',
      })
    if (!input.expiresOn && part.hasExpiry) {
      const suggestion = suggestedExpiry(input.receivedOn, part.shelfLifeDays)
      const hint = suggestion ? ` (its shelf life suggests ${suggestion})` : ''
      throw AppError.badRequest(
        `expiresOn: ${part.partNumber} ages: enter the expiry date from the label${hint}`,
        { expiresOn: `enter the expiry date from the label${hint}` },
      )
    }
    const { supplier } = await findOrAddSupplier(input.supplierName, actor, transaction)
    const internalCode = await nextInternalCode(input.receivedOn, transaction)
    const { supplierName: _typed, ...fields } = input
    const lot = await ComponentLot.create(
      {
        ...fields,
        supplierId: supplier.id,
        internalCode,
        quantityRemaining: input.quantityReceived,
        certificateUploadId: null,
        status: part.needsInspection ? 'quarantined' : 'available',
        awaitsInspection: part.needsInspection,
      },
      { transaction },
    )
    const dto = toComponentLotDto(await loadLot(lot.id, transaction))
    return auditCreated(actor, 'component_lot.receive', lot.id, dto, transaction)
  })
}

/**
 * Corrects a lot's details or its remaining quantity after a stock count. Reaching 0 marks it
 * used up; a count that finds stock in a used-up lot makes it available again.
 */
export async function updateComponentLot(
  id: string,
  input: ComponentLotUpdateInput,
  actor: Actor,
): Promise<ComponentLotDto> {
  return withTransaction(async (transaction) => {
    const lot = await loadLot(id, transaction, true)
    if (input.quantityRemaining !== undefined && input.quantityRemaining > lot.quantityReceived)
      throw AppError.badRequest('quantityRemaining: more than was received', {
        quantityRemaining: 'more than was received',
      })
    if (input.expiresOn && input.expiresOn < lot.receivedOn)
      throw AppError.badRequest('expiresOn: the expiry date is before the date received', {
        expiresOn: 'before the date received',
      })
    const { supplierName: typed, ...fields } = input
    return auditedUpdate(
      actor,
      'component_lot.update',
      id,
      transaction,
      () => toComponentLotDto(lot),
      async () => {
        lot.set(fields)
        if (typed !== undefined) {
          const { supplier } = await findOrAddSupplier(typed, actor, transaction)
          lot.supplierId = supplier.id
          lot.supplier = supplier
        }
        if (lot.quantityRemaining === 0 && lot.status === 'available') lot.status = 'used_up'
        if (lot.quantityRemaining > 0 && lot.status === 'used_up') lot.status = 'available'
        return lot.save({ transaction })
      },
    )
  })
}

/** Moves a lot to another status along LOT_STATUS_MOVES, with the reason in the audit log. */
export async function setComponentLotStatus(
  id: string,
  input: ComponentLotStatusInput,
  actor: Actor,
): Promise<ComponentLotDto> {
  return withTransaction(async (transaction) => {
    // A contained lot leaves quarantine only when its containment ends (containment.ts), which
    // also decides its units.
    const lot = await ComponentLot.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    const held = lot?.status === 'quarantined' ? await containedUnitIds(id, transaction) : []
    if (held.length > 0)
      throw AppError.conflict(
        'lot_contained',
        `${held.length} unit(s) are held by the containment of this lot: end the containment on its recall page in Trace, which also moves the lot`,
      )
    return moveComponentLotStatus(id, input, actor, transaction)
  })
}

/** The units on a containment's hold that hold this component lot. */
export async function containedUnitIds(
  componentLotId: string,
  transaction?: Transaction,
): Promise<string[]> {
  const rows = await select<{ id: string }>(
    `SELECT DISTINCT u.id
       FROM consumptions co JOIN units u ON u.id = co.unit_id
      WHERE co.component_lot_id = :componentLotId
        AND u.state = 'on_hold' AND u.hold_kind = 'containment'`,
    { replacements: { componentLotId }, transaction },
  )
  return rows.map((r) => r.id)
}

/**
 * The status move inside the caller's transaction (a containment quarantines the lot together
 * with holding its units): locks the lot, refuses a move LOT_STATUS_MOVES does not allow, audits.
 */
export async function moveComponentLotStatus(
  id: string,
  input: ComponentLotStatusInput,
  actor: Actor,
  transaction: Transaction,
): Promise<ComponentLotDto> {
  const lot = await loadLot(id, transaction, true)
  const from: ComponentLotStatus = lot.status
  if (lot.awaitsInspection && input.status !== 'rejected')
    throw AppError.conflict(
      'awaiting_inspection',
      `lot ${lot.internalCode} is awaiting incoming inspection: accept it (with its certificate) or reject it there`,
      { status: 'awaiting incoming inspection' },
    )
  if (!LOT_STATUS_MOVES[from].includes(input.status))
    throw AppError.conflict(
      'status_move_refused',
      `a ${from.replace('_', ' ')} lot cannot become ${input.status.replace('_', ' ')}`,
      {
        status: `not allowed from ${from}`,
      },
    )
  // Rejecting a lot that awaits inspection is the inspection's end too.
  await lot.update({ status: input.status, awaitsInspection: false }, { transaction })
  const change = { before: { status: from }, after: { status: input.status, reason: input.reason } }
  await auditAction(actor, 'component_lot.status', id, change, transaction)
  return toComponentLotDto(lot)
}

/** Stores a supplier certificate (PDF, PNG or JPEG, checked by content) and attaches it. */
export async function attachCertificate(
  id: string,
  file: { buffer: Buffer; originalname: string },
  actor: Actor,
): Promise<ComponentLotDto> {
  if (file.buffer.length > CERTIFICATE_MAX_BYTES)
    throw AppError.tooLarge('file: the certificate is over 10 MB')
  return withTransaction(async (transaction) => {
    const lot = await loadLot(id, transaction, true)
    const upload = await storeUpload(file, CERTIFICATE_TYPES, 'certificates', actor.id, transaction)
    const before = lot.certificate ? toUploadDto(lot.certificate) : null
    await lot.update({ certificateUploadId: upload.id }, { transaction })
    lot.certificate = upload
    const change = { before: { certificate: before }, after: { certificate: toUploadDto(upload) } }
    await auditAction(actor, 'component_lot.certificate', id, change, transaction)
    return toComponentLotDto(lot)
  })
}

/** Where a lot's certificate is stored, with its name and type, or a 404. */
export async function certificateOf(
  id: string,
): Promise<{ storageKey: string; filename: string; contentType: string }> {
  const lot = await loadLot(id)
  if (!lot.certificate) throw AppError.notFound(`certificate of component lot ${lot.internalCode}`)
  return lot.certificate
}

/**
 * Stores' decision at incoming inspection on a lot that awaits it. Accepting needs the
 * supplier's certificate attached and makes the lot available; rejecting makes it rejected
 * (final). Who decided, when, and the note stay on the lot and in the audit log.
 */
export async function inspectComponentLot(
  id: string,
  input: ComponentLotInspectionInput,
  actor: Actor,
): Promise<ComponentLotDto> {
  return withTransaction(async (transaction) => {
    const lot = await loadLot(id, transaction, true)
    if (!lot.awaitsInspection)
      throw AppError.conflict(
        'not_awaiting_inspection',
        `lot ${lot.internalCode} is not awaiting incoming inspection`,
      )
    if (input.decision === 'accept' && !lot.certificate)
      throw AppError.badRequest(
        "certificate: attach the supplier's certificate before accepting the lot",
        { certificate: "attach the supplier's certificate first" },
      )
    const before = toComponentLotDto(lot)
    await lot.update(
      {
        status: input.decision === 'accept' ? 'available' : 'rejected',
        awaitsInspection: false,
        inspectedAt: new Date(),
        inspectedBy: actor.id,
        inspectionNote: input.note,
      },
      { transaction },
    )
    const after = toComponentLotDto(lot)
    await auditAction(
      actor,
      'component_lot.inspection',
      id,
      {
        before: { status: before.status, awaitsInspection: true },
        after: {
          decision: input.decision,
          status: after.status,
          note: input.note,
          certificate: after.certificate?.sha256 ?? null,
        },
      },
      transaction,
    )
    return after
  })
}
