import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../../shared/links'
import { PASSED_UNIT_STATES, UNIT_STATE_LABELS } from '../../../shared/lots'
import type { UnitState } from '../../../shared/lots'
import type {
  CertificateRequestInput,
  OpenReturnDto,
  ShipmentCreateInput,
  ShipmentDto,
  ShipmentSummaryDto,
  ShippableUnitDto,
} from '../../../shared/schemas/shipping'
import { AppError } from '../../errors'
import { Customer, Document, Shipment, ShipmentUnit, Unit } from '../../models'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { requestDocument, toDocumentDto } from '../documents'
import { isoTime, pickCamel } from '../presenters'
import { OPEN_RETURNS_SQL, UNIT_DOCUMENTS_SQL } from '../trace'
import { select, withTransaction } from '../../db/sql'

interface UnitRow {
  id: string
  serial: string
  state: UnitState
  lot_number: string
  product_code: string
  revision_letter: string
  lot_customer_id: string | null
  lot_customer_name: string | null
}

const SELECT_UNITS = `
  SELECT u.id, u.serial, u.state, l.number AS lot_number, p.code AS product_code,
         r.letter AS revision_letter, l.customer_id AS lot_customer_id,
         coalesce(lc.name, nullif(l.customer_name, '')) AS lot_customer_name
    FROM units u
    JOIN lots l ON l.id = u.lot_id
    JOIN revisions r ON r.id = l.revision_id
    JOIN products p ON p.id = r.product_id
    LEFT JOIN customers lc ON lc.id = l.customer_id`

/** Why a unit in `state` may not ship, or null when it may (it passed its whole route). */
export function shipRefusal(state: UnitState): string | null {
  if (state === 'passed') return null
  if (state === 'shipped') return 'it has shipped already'
  return `it is ${UNIT_STATE_LABELS[state].toLowerCase()}, not passed: only a unit that passed its whole route ships`
}

/** A scanned serial (bare or a traveler URL) checked for packing, before anything is saved. */
export async function checkShippable(scanned: string): Promise<ShippableUnitDto> {
  const serial = codeFromScan(scanned)
  const [row] = await select<UnitRow>(`${SELECT_UNITS} WHERE u.serial = :serial`, {
    replacements: { serial },
  })
  if (!row) throw AppError.notFound(`unit ${serial}`)
  return {
    ...pickCamel(row, [
      'serial',
      'state',
      'lot_number',
      'product_code',
      'revision_letter',
      'lot_customer_id',
      'lot_customer_name',
    ]),
    refusal: shipRefusal(row.state),
  }
}

interface ShipmentRow {
  id: string
  number: string
  customer_id: string
  customer_name: string
  customer_email: string
  order_ref: string
  carrier: string
  tracking: string
  shipped_on: string
  unit_count: string
  created_by: string | null
  created_at: Date
}

const SELECT_SHIPMENT = `
  SELECT s.id, s.number, s.customer_id, c.name AS customer_name, c.contact_email AS customer_email,
         s.order_ref, s.carrier, s.tracking, s.shipped_on::text AS shipped_on,
         (SELECT count(*) FROM shipment_units su WHERE su.shipment_id = s.id) AS unit_count,
         cu.name AS created_by, s.created_at
    FROM shipments s
    JOIN customers c ON c.id = s.customer_id
    LEFT JOIN users cu ON cu.id = s.created_by`

function toSummary(r: ShipmentRow): ShipmentSummaryDto {
  return {
    ...pickCamel(r, [
      'id',
      'number',
      'customer_id',
      'customer_name',
      'order_ref',
      'carrier',
      'tracking',
      'shipped_on',
      'created_by',
    ]),
    unitCount: Number(r.unit_count),
    createdAt: isoTime(r.created_at),
  }
}

/** Shipments, newest first, optionally of one customer. */
export async function listShipments(q: { customerId?: string }): Promise<ShipmentSummaryDto[]> {
  const rows = await select<ShipmentRow>(
    `${SELECT_SHIPMENT} ${q.customerId ? 'WHERE s.customer_id = :customerId' : ''}
     ORDER BY s.shipped_on DESC, s.number DESC LIMIT 500`,
    { replacements: q },
  )
  return rows.map(toSummary)
}

/** One shipment with its units and its documents (packing slip, certificates). */
export async function getShipment(id: string, transaction?: Transaction): Promise<ShipmentDto> {
  const [row] = await select<ShipmentRow>(`${SELECT_SHIPMENT} WHERE s.id = :id`, {
    replacements: { id },
    transaction,
  })
  if (!row) throw AppError.notFound(`shipment ${id}`)
  const units = await select<UnitRow>(
    `${SELECT_UNITS} JOIN shipment_units su ON su.unit_id = u.id
      WHERE su.shipment_id = :id ORDER BY u.serial`,
    { replacements: { id }, transaction },
  )
  const documents = await Document.findAll({
    where: { shipmentId: id },
    order: [['createdAt', 'DESC']],
    transaction,
  })
  return {
    ...toSummary(row),
    customerEmail: row.customer_email,
    units: units.map((u) =>
      pickCamel(u, ['serial', 'lot_number', 'product_code', 'revision_letter', 'state']),
    ),
    documents: documents.map(toDocumentDto),
  }
}

/** The file name of a shipment's paper, e.g. `S-0007-packing-slip.pdf`. */
export function shipmentFilename(number: string, kind: 'packing_slip' | 'certificate'): string {
  return `${number}-${kind === 'packing_slip' ? 'packing-slip' : 'certificate'}.pdf`
}

/**
 * Ships units that passed their whole route to a customer. Every unit is locked first (in serial
 * order, so two packers never deadlock); if any is not `passed`, nothing is saved and the 409
 * names each such serial with its state. The packing slip is requested in the same transaction.
 */
export async function createShipment(
  input: ShipmentCreateInput,
  actor: Actor,
  transaction?: Transaction,
  /** When it was packed, if not now: the demo seed's clock. */
  at?: Date,
): Promise<ShipmentDto> {
  const run = async (t: Transaction) => {
    const serials = input.serials.map(codeFromScan)
    const seen = new Set<string>()
    const repeated = serials.filter((s) => (seen.has(s) ? true : (seen.add(s), false)))
    if (repeated.length)
      throw AppError.badRequest(`serials: ${repeated[0]} is listed twice`, {
        serials: `${repeated.join(', ')} listed twice`,
      })
    const customer = await Customer.findByPk(input.customerId, { transaction: t })
    if (!customer)
      throw AppError.badRequest('customerId: no such customer', {
        customerId: 'no such customer',
      })
    const units = await Unit.findAll({
      where: { serial: { [Op.in]: serials } },
      order: [['serial', 'ASC']],
      transaction: t,
      lock: t.LOCK.UPDATE,
    })
    const bySerial = new Map(units.map((u) => [u.serial, u]))
    const problems: string[] = []
    for (const serial of serials) {
      const unit = bySerial.get(serial)
      if (!unit) problems.push(`${serial}: no such unit`)
      else {
        const refusal = shipRefusal(unit.state)
        if (refusal) problems.push(`${serial}: ${unit.state} (${refusal})`)
      }
    }
    if (problems.length)
      throw new AppError(
        409,
        'units_not_shippable',
        `${problems.length} of ${serials.length} units cannot ship: ${problems.join('; ')}`,
        { serials: problems.join('; ') },
        problems,
      )
    const [seq] = await select<{ n: string }>(`SELECT nextval('shipment_number_seq') AS n`, {
      transaction: t,
    })
    const shipment = await Shipment.create(
      {
        number: `S-${String(seq!.n).padStart(4, '0')}`,
        customerId: customer.id,
        orderRef: input.orderRef,
        carrier: input.carrier,
        tracking: input.tracking,
        shippedOn: input.shippedOn,
        createdBy: actor.id,
        ...(at ? { createdAt: at } : {}),
      },
      { transaction: t },
    )
    await ShipmentUnit.bulkCreate(
      units.map((u) => ({ unitId: u.id, shipmentId: shipment.id })),
      { transaction: t },
    )
    await Unit.update(
      { state: 'shipped' },
      { where: { id: { [Op.in]: units.map((u) => u.id) } }, transaction: t },
    )
    await recordAudit(
      actor,
      {
        action: 'shipment.create',
        entity: 'shipment',
        entityId: shipment.id,
        at,
        after: {
          number: shipment.number,
          customer: customer.name,
          orderRef: input.orderRef,
          carrier: input.carrier,
          tracking: input.tracking,
          shippedOn: input.shippedOn,
          serials: units.map((u) => u.serial),
        },
      },
      t,
    )
    await requestDocument(
      {
        kind: 'packing_slip',
        shipmentId: shipment.id,
        filename: shipmentFilename(shipment.number, 'packing_slip'),
      },
      actor,
      t,
      at,
    )
    return getShipment(shipment.id, t)
  }
  return transaction ? run(transaction) : withTransaction(run)
}

/** Requests a certificate of conformance listing every serial of a shipment. */
export async function requestShipmentCertificate(
  id: string,
  input: CertificateRequestInput,
  actor: Actor,
) {
  return withTransaction(async (transaction) => {
    const shipment = await Shipment.findByPk(id, { transaction })
    if (!shipment) throw AppError.notFound(`shipment ${id}`)
    if (!input.confirmOpenReturn) {
      const units = await ShipmentUnit.findAll({ where: { shipmentId: id }, transaction })
      await refuseOpenReturns(
        units.map((u) => u.unitId),
        transaction,
      )
    }
    const doc = await requestDocument(
      {
        kind: 'certificate',
        shipmentId: id,
        filename: shipmentFilename(shipment.number, 'certificate'),
      },
      actor,
      transaction,
    )
    return toDocumentDto(doc)
  })
}

/**
 * Requests a certificate of conformance for one serial. A unit that has not passed its route
 * has nothing to certify.
 */
export async function requestUnitCertificate(
  scanned: string,
  input: CertificateRequestInput,
  actor: Actor,
) {
  const serial = codeFromScan(scanned)
  return withTransaction(async (transaction) => {
    const unit = await Unit.findOne({ where: { serial }, transaction })
    if (!unit) throw AppError.notFound(`unit ${serial}`)
    if (!PASSED_UNIT_STATES.includes(unit.state))
      throw AppError.conflict(
        'unit_not_passed',
        `${serial} is ${UNIT_STATE_LABELS[unit.state as UnitState].toLowerCase()}: a certificate needs a unit that passed its route`,
      )
    if (!input.confirmOpenReturn) await refuseOpenReturns([unit.id], transaction)
    const doc = await requestDocument(
      { kind: 'certificate', unitId: unit.id, filename: `${serial}-certificate.pdf` },
      actor,
      transaction,
    )
    return toDocumentDto(doc)
  })
}

/**
 * Refuses a certificate while any of the units has a return open, naming each case: the
 * customer has just sent the unit back, so the person must say they mean it
 * (`confirmOpenReturn`).
 */
async function refuseOpenReturns(unitIds: string[], transaction: Transaction): Promise<void> {
  if (!unitIds.length) return
  const open = await select<OpenReturnDto>(OPEN_RETURNS_SQL, { bind: [unitIds], transaction })
  if (!open.length) return
  const named = open.map((r) => `${r.serial} has open return ${r.number}`).join('; ')
  throw new AppError(
    409,
    'open_return',
    `${named}: send confirmOpenReturn: true to issue the certificate anyway`,
    { confirmOpenReturn: 'confirm to certify a unit with an open return' },
    { openReturns: open },
  )
}

/**
 * Every document of one serial, newest first: its certificates, its shipment's papers and its
 * lot's travelers and labels, by the same rule the trace lists them (UNIT_DOCUMENTS_SQL).
 */
export async function listUnitDocuments(scanned: string) {
  const serial = codeFromScan(scanned)
  const unit = await Unit.findOne({ where: { serial } })
  if (!unit) throw AppError.notFound(`unit ${serial}`)
  const ids = (await select<{ id: string }>(UNIT_DOCUMENTS_SQL, { bind: [serial] })).map(
    (r) => r.id,
  )
  const docs = await Document.findAll({ where: { id: ids } })
  const byId = new Map(docs.map((d) => [d.id, d]))
  return ids.map((id) => toDocumentDto(byId.get(id)!))
}
