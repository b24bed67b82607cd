import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../../shared/links'
import type { UnitState } from '../../../shared/lots'
import { CONTAINABLE_STATES, RECALL_GROUP_LABELS } from '../../../shared/schemas/trace'
import type {
  ContainResultDto,
  RecallCustomerDto,
  RecallGroup,
  RecallScopeDto,
  RecallUnitDto,
} from '../../../shared/schemas/trace'
import { AppError } from '../../errors'
import { ComponentLot, Email, Part, Supplier, Unit } from '../../models'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { moveComponentLotStatus } from '../receiving'
import { pickFields } from '../presenters'
import { writeCsv } from '../../csv'
import { draftEmail } from '../mail'
import { RECALL_SCOPE_SQL } from './traceQueries'
import { select, withTransaction } from '../../db/sql'

interface ScopeRow {
  unit_id: string
  serial: string
  state: UnitState
  held_from_state: UnitState | null
  hold_kind: string | null
  lot_number: string
  customer_id: string | null
  customer_name: string
  contact_email: string
  shipment_number: string | null
  shipped_on: string | null
  quantity: number
}

/** Where a unit stands for a recall; a held unit counts where it was when it was held. */
export function recallGroupOf(state: UnitState, heldFrom: UnitState | null): RecallGroup {
  const s = state === 'on_hold' ? (heldFrom ?? 'in_progress') : state
  if (s === 'shipped' || s === 'returned') return 'shipped'
  if (s === 'passed' || s === 'scrapped') return 'finished'
  return 'in_progress'
}

const zeroCounts = (): Record<RecallGroup, number> => ({ in_progress: 0, finished: 0, shipped: 0 })

/** A component lot by its internal code or label URL, with its part; 404 when unknown. */
export async function findComponentLot(scanned: string, transaction?: Transaction) {
  const code = codeFromScan(scanned)
  const lot = await ComponentLot.findOne({
    where: { internalCode: code },
    include: [
      { model: Part, as: 'part' },
      { model: Supplier, as: 'supplier' },
    ],
    transaction,
  })
  if (!lot) throw AppError.notFound(`component lot ${code}`)
  return lot
}

/**
 * Every unit that holds a component lot, grouped by where it stands and by customer (the
 * shipment's customer once shipped, else the lot's), with counts. Two indexed queries.
 */
export async function recallScope(scanned: string, transaction?: Transaction) {
  const lot = await findComponentLot(scanned, transaction)
  const rows = await select<ScopeRow>(RECALL_SCOPE_SQL, {
    bind: [lot.internalCode],
    transaction,
  })
  const units: RecallUnitDto[] = rows.map((r) => ({
    unitId: r.unit_id,
    serial: r.serial,
    state: r.state,
    group: recallGroupOf(r.state, r.held_from_state),
    lotNumber: r.lot_number,
    customerId: r.customer_id,
    customerName: r.customer_name,
    shipmentNumber: r.shipment_number,
    shippedOn: r.shipped_on,
    quantity: Number(r.quantity),
    isContained: r.state === 'on_hold' && r.hold_kind === 'containment',
  }))
  const counts = { ...zeroCounts(), total: units.length, scrapped: 0 }
  const byCustomer = new Map<string, RecallCustomerDto>()
  rows.forEach((r, i) => {
    const u = units[i]!
    counts[u.group]++
    if (u.state === 'scrapped') counts.scrapped++
    const key = r.customer_id ?? `name:${r.customer_name.toLowerCase()}`
    const c = byCustomer.get(key) ?? {
      customerId: r.customer_id,
      customerName: r.customer_name,
      contactEmail: r.contact_email,
      counts: zeroCounts(),
      total: 0,
    }
    c.counts[u.group]++
    c.total++
    byCustomer.set(key, c)
  })
  const scope: RecallScopeDto = {
    componentLot: {
      ...pickFields(lot, ['id', 'internalCode', 'supplierLotCode', 'status', 'receivedOn']),
      partNumber: lot.part?.partNumber ?? '',
      partDescription: lot.part?.description ?? '',
      supplierName: lot.supplier?.name ?? '',
    },
    counts,
    // Shipped units first: those are the customers to call.
    customers: [...byCustomer.values()].sort(
      (a, b) => b.counts.shipped - a.counts.shipped || a.customerName.localeCompare(b.customerName),
    ),
    units,
  }
  return scope
}

/** The recall scope as CSV, one row per unit, for a spreadsheet or a customer. */
export function recallCsv(scope: RecallScopeDto): string {
  return writeCsv(
    [
      [
        'serial',
        'where',
        'state',
        'lot',
        'customer',
        'shipment',
        'shipped_on',
        'component_lot',
        'supplier_lot',
        'quantity_fitted',
      ],
      ...scope.units.map((u) => [
        u.serial,
        RECALL_GROUP_LABELS[u.group],
        u.state,
        u.lotNumber,
        u.customerName,
        u.shipmentNumber ?? '',
        u.shippedOn ?? '',
        scope.componentLot.internalCode,
        scope.componentLot.supplierLotCode,
        u.quantity,
      ]),
    ],
    'unix',
  )
}

function letterText(scope: RecallScopeDto, customerName: string, serials: string[]): string {
  const cl = scope.componentLot
  return [
    `Dear ${customerName || 'customer'},`,
    '',
    `We have found a possible problem with a batch of ${cl.partDescription || cl.partNumber} ` +
      `(our component lot ${cl.internalCode}, supplier lot ${cl.supplierLotCode}). ` +
      `It was fitted to ${serials.length === 1 ? 'this unit' : `these ${serials.length} units`} we shipped to you:`,
    '',
    ...serials.map((s) => `  ${s}`),
    '',
    'Please keep these units out of service until we contact you with what to do next.',
    'Reply to this e-mail with any questions.',
    '',
    'Customer service',
  ].join('\n')
}

/**
 * Contains a suspect component lot in one transaction: holds every affected unit still in the
 * shop (audited per unit), quarantines the lot through the status rules, and writes one draft
 * letter per customer with shipped units for service to review and send.
 */
export async function containComponentLot(
  scanned: string,
  reason: string,
  actor: Actor,
  /** When it was contained, if not now: the demo seed's clock. */
  at?: Date,
): Promise<ContainResultDto> {
  return withTransaction(async (transaction) => {
    const found = await findComponentLot(scanned, transaction)
    // Lock the lot first, so two leads containing it at once run one after the other.
    await ComponentLot.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE })
    const scope = await recallScope(found.internalCode, transaction)
    const ids = scope.units.map((u) => u.unitId)
    const units = ids.length
      ? await Unit.findAll({
          where: { id: { [Op.in]: ids } },
          transaction,
          lock: transaction.LOCK.UPDATE,
          order: [['serial', 'ASC']],
        })
      : []
    const holdReason = `component lot ${found.internalCode} contained: ${reason}`.slice(0, 500)
    const held: string[] = []
    const alreadyHeld: string[] = []
    for (const u of units) {
      if (u.state === 'on_hold') {
        alreadyHeld.push(u.serial)
        continue
      }
      if (!CONTAINABLE_STATES.includes(u.state)) continue
      const before = { state: u.state }
      // The lot-hold rule: remember the state to go back to, say why.
      await u.update(
        { heldFromState: u.state, state: 'on_hold', holdKind: 'containment', holdReason },
        { transaction },
      )
      await auditAction(
        actor,
        'unit.hold',
        u.id,
        {
          at,
          before,
          after: { state: 'on_hold', serial: u.serial, reason: holdReason },
        },
        transaction,
      )
      held.push(u.serial)
    }
    let quarantined = false
    if (found.status === 'available' || found.status === 'used_up') {
      await moveComponentLotStatus(
        found.id,
        { status: 'quarantined', reason: `contained: ${reason}` },
        actor,
        transaction,
      )
      quarantined = true
    }
    const drafts: ContainResultDto['drafts'] = []
    const noContact: string[] = []
    for (const c of scope.customers) {
      const serials = scope.units
        .filter((u) => u.state === 'shipped' && u.customerId === c.customerId)
        .map((u) => u.serial)
      if (!serials.length) continue
      if (!c.contactEmail) {
        noContact.push(c.customerName)
        continue
      }
      // Containing the lot again writes no second letter while the first is still a draft.
      const pending = await Email.findOne({
        where: {
          status: 'draft',
          relatedEntity: 'component_lot',
          relatedId: found.id,
          toAddresses: { [Op.contains]: [c.contactEmail] },
        },
        transaction,
      })
      if (pending) continue
      const email = await draftEmail(
        {
          to: c.contactEmail,
          subject: `Units to hold: component lot ${found.internalCode} under investigation`,
          text: letterText(scope, c.customerName, serials),
          related: { entity: 'component_lot', id: found.id },
        },
        actor,
        transaction,
      )
      drafts.push({ emailId: email.id, customerName: c.customerName, to: c.contactEmail, serials })
    }
    await auditAction(
      actor,
      'component_lot.contain',
      found.id,
      {
        at,
        after: { reason, held, alreadyHeld, quarantined, drafts: drafts.map((d) => d.emailId) },
      },
      transaction,
    )
    return {
      scope: await recallScope(found.internalCode, transaction),
      held,
      alreadyHeld,
      quarantined,
      drafts,
      noContact,
    }
  })
}
