import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../../shared/links'
import { UNIT_STATE_LABELS } from '../../../shared/lots'
import type { UnitState } from '../../../shared/lots'
import type { ServiceCaseResolution, ServiceCaseStatus } from '../../../shared/service'
import type {
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseDto,
  ServiceCaseQuery,
  ServiceCaseUpdateInput,
  ReturnableUnitDto,
} from '../../../shared/schemas/shipping'
import { AppError } from '../../errors'
import { DefectCode, Lot, RouteStep, ServiceCase, Unit } from '../../models'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { createShipment } from '../shipping'
import { reworkTarget, sendToRework } from '../units'
import { isoTime, isoTimeOrNull, pickCamel } from '../presenters'
import { select, withTransaction } from '../../db/sql'

interface CaseRow {
  id: string
  number: string
  serial: string
  unit_state: UnitState
  lot_id: string
  lot_number: string
  product_code: string
  revision_id: string
  revision_letter: string
  customer_id: string | null
  customer_name: string | null
  shipment_number: string | null
  complaint: string
  received_on: string
  findings: string
  defect_code_id: string | null
  defect_code: string | null
  resolution: ServiceCaseResolution | null
  rework_step_name: string | null
  replacement_serial: string | null
  status: ServiceCaseStatus
  opened_by: string | null
  closed_by: string | null
  closed_at: Date | null
  created_at: Date
}

// The shipment shown is the one the unit came back from: its latest before the case was opened.
const SELECT_CASE = `
  SELECT sc.id, sc.number, u.serial, u.state AS unit_state, l.id AS lot_id, l.number AS lot_number,
         p.code AS product_code, r.id AS revision_id, r.letter AS revision_letter,
         sc.customer_id, c.name AS customer_name,
         (SELECT s.number FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
           WHERE su.unit_id = u.id AND su.created_at <= sc.created_at
           ORDER BY su.created_at DESC LIMIT 1) AS shipment_number,
         sc.complaint, sc.received_on::text AS received_on, sc.findings, sc.defect_code_id,
         dc.code AS defect_code, sc.resolution, rs.name AS rework_step_name,
         ru.serial AS replacement_serial, sc.status, ob.name AS opened_by, cb.name AS closed_by,
         sc.closed_at, sc.created_at
    FROM service_cases sc
    JOIN units u ON u.id = sc.unit_id
    JOIN lots l ON l.id = u.lot_id
    JOIN revisions r ON r.id = l.revision_id
    JOIN products p ON p.id = r.product_id
    LEFT JOIN customers c ON c.id = sc.customer_id
    LEFT JOIN defect_codes dc ON dc.id = sc.defect_code_id
    LEFT JOIN route_steps rs ON rs.id = sc.rework_to_step_id
    LEFT JOIN units ru ON ru.id = sc.replacement_unit_id
    LEFT JOIN users ob ON ob.id = sc.opened_by
    LEFT JOIN users cb ON cb.id = sc.closed_by`

function toDto(r: CaseRow): ServiceCaseDto {
  return {
    ...pickCamel(r, [
      'id',
      'number',
      'serial',
      'unit_state',
      'lot_id',
      'lot_number',
      'product_code',
      'revision_id',
      'revision_letter',
      'customer_id',
      'customer_name',
      'shipment_number',
      'complaint',
      'received_on',
      'findings',
      'defect_code_id',
      'defect_code',
      'resolution',
      'replacement_serial',
      'status',
      'opened_by',
      'closed_by',
    ]),
    reworkToStepName: r.rework_step_name,
    closedAt: isoTimeOrNull(r.closed_at),
    createdAt: isoTime(r.created_at),
  }
}

/** Service cases, open ones first and then newest first, by status, lot or serial. */
export async function listServiceCases(q: ServiceCaseQuery): Promise<ServiceCaseDto[]> {
  const where = ['TRUE']
  if (q.status) where.push('sc.status = :status')
  if (q.lotId) where.push('l.id = :lotId')
  if (q.serial) where.push('u.serial = :serial')
  const rows = await select<CaseRow>(
    `${SELECT_CASE} WHERE ${where.join(' AND ')}
     ORDER BY sc.status = 'open' DESC, sc.created_at DESC LIMIT 500`,
    {
      replacements: { ...q, serial: q.serial ? codeFromScan(q.serial) : undefined },
    },
  )
  return rows.map(toDto)
}

/** One service case. */
export async function getServiceCase(
  id: string,
  transaction?: Transaction,
): Promise<ServiceCaseDto> {
  const [row] = await select<CaseRow>(`${SELECT_CASE} WHERE sc.id = :id`, {
    replacements: { id },
    transaction,
  })
  if (!row) throw AppError.notFound(`service case ${id}`)
  return toDto(row)
}

const stateWords = (state: UnitState) => UNIT_STATE_LABELS[state].toLowerCase()

/**
 * A scanned serial checked for logging a return, before anything is saved: the unit, its
 * product and the customer it came back from, so the person sees they have the right unit.
 * An unknown serial is a 404; a unit that cannot be returned says why in `refusal`.
 */
export async function checkReturnable(scanned: string): Promise<ReturnableUnitDto> {
  const serial = codeFromScan(scanned)
  const [row] = await select<{
    serial: string
    state: UnitState
    product_code: string
    product_name: string
    revision_letter: string
    lot_number: string
    customer_name: string | null
    shipment_number: string | null
    shipped_on: string | null
    open_case: string | null
  }>(
    `SELECT u.serial, u.state, p.code AS product_code, p.name AS product_name,
            r.letter AS revision_letter, l.number AS lot_number,
            coalesce(shc.name, lc.name, nullif(l.customer_name, '')) AS customer_name,
            sh.number AS shipment_number, sh.shipped_on::text AS shipped_on,
            (SELECT sc.number FROM service_cases sc
              WHERE sc.unit_id = u.id AND sc.status = 'open') AS open_case
       FROM units u
       JOIN lots l ON l.id = u.lot_id
       JOIN revisions r ON r.id = l.revision_id
       JOIN products p ON p.id = r.product_id
       LEFT JOIN customers lc ON lc.id = l.customer_id
       LEFT JOIN LATERAL (
         SELECT s.number, s.shipped_on, s.customer_id
           FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
          WHERE su.unit_id = u.id ORDER BY su.created_at DESC LIMIT 1
       ) sh ON true
       LEFT JOIN customers shc ON shc.id = sh.customer_id
      WHERE u.serial = :serial`,
    { replacements: { serial } },
  )
  if (!row) throw AppError.notFound(`unit ${serial}`)
  const refusal = row.open_case
    ? `return ${row.open_case} is already open for it`
    : row.state !== 'shipped'
      ? `it is ${stateWords(row.state)}: a return is logged for a unit that shipped`
      : null
  return {
    serial: row.serial,
    state: row.state,
    productCode: row.product_code,
    productName: row.product_name,
    revisionLetter: row.revision_letter,
    lotNumber: row.lot_number,
    customerName: row.customer_name,
    shipmentNumber: row.shipment_number,
    shippedOn: row.shipped_on,
    refusal,
  }
}

/**
 * Opens a case for a shipped unit that came back: the unit becomes `returned` and the case names
 * the customer of the shipment it came back from.
 */
export async function openServiceCase(
  input: ServiceCaseCreateInput,
  actor: Actor,
  /** When it was opened, if not now: the demo seed's clock. */
  at?: Date,
): Promise<ServiceCaseDto> {
  const serial = codeFromScan(input.serial)
  return withTransaction(async (transaction) => {
    const unit = await Unit.findOne({
      where: { serial },
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    if (!unit) throw AppError.badRequest(`serial: no unit ${serial}`, { serial: 'no such unit' })
    if (unit.state !== 'shipped')
      throw AppError.conflict(
        'unit_not_shipped',
        `${serial} is ${stateWords(unit.state)}: a return is opened for a unit that shipped`,
        { serial: `${stateWords(unit.state)}, not shipped` },
      )
    const [shipment] = await select<{ customer_id: string }>(
      `SELECT s.customer_id FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
        WHERE su.unit_id = :unitId ORDER BY su.created_at DESC LIMIT 1`,
      { replacements: { unitId: unit.id }, transaction },
    )
    const [seq] = await select<{ n: string }>(`SELECT nextval('service_case_number_seq') AS n`, {
      transaction,
    })
    const sc = await ServiceCase.create(
      {
        number: `SC-${String(seq!.n).padStart(4, '0')}`,
        unitId: unit.id,
        customerId: shipment?.customer_id ?? null,
        complaint: input.complaint,
        receivedOn: input.receivedOn,
        defectCodeId: null,
        resolution: null,
        replacementUnitId: null,
        openedBy: actor.id,
        closedBy: null,
        closedAt: null,
        ...(at ? { createdAt: at } : {}),
      },
      { transaction },
    )
    await unit.update({ state: 'returned' }, { transaction })
    await auditAction(
      actor,
      'service_case.open',
      sc.id,
      {
        at,
        before: { unitState: 'shipped' },
        after: {
          number: sc.number,
          serial,
          complaint: input.complaint,
          receivedOn: input.receivedOn,
          unitState: 'returned',
        },
      },
      transaction,
    )
    return getServiceCase(sc.id, transaction)
  })
}

async function lockOpenCase(id: string, transaction: Transaction): Promise<ServiceCase> {
  const sc = await ServiceCase.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!sc) throw AppError.notFound(`service case ${id}`)
  if (sc.status !== 'open')
    throw AppError.conflict('service_case_closed', `service case ${sc.number} is closed`)
  return sc
}

/** Records what the bench found and the defect code, while the case is open. */
export async function updateServiceCase(
  id: string,
  input: ServiceCaseUpdateInput,
  actor: Actor,
): Promise<ServiceCaseDto> {
  return withTransaction(async (transaction) => {
    const sc = await lockOpenCase(id, transaction)
    if (input.defectCodeId && !(await DefectCode.findByPk(input.defectCodeId, { transaction })))
      throw AppError.badRequest('defectCodeId: no such defect code', {
        defectCodeId: 'no such defect code',
      })
    const before = { findings: sc.findings, defectCodeId: sc.defectCodeId }
    await sc.update(input, { transaction })
    await auditAction(
      actor,
      'service_case.update',
      id,
      {
        before,
        after: { findings: sc.findings, defectCodeId: sc.defectCodeId },
      },
      transaction,
    )
    return getServiceCase(id, transaction)
  })
}

/**
 * Closes a case with its resolution.
 * - repair: the returned unit goes back into the Floor `in_rework` at the chosen step of its own
 *   route, through the same rework path as a nonconformance, and must pass every step from there
 *   to the end again. A closed lot is reopened so the Floor accepts the unit.
 * - replace: the replacement serial must be `passed`; it ships at once to the same customer in a
 *   new shipment whose order reference names the case (so its packing slip and trace say why).
 *   The returned unit stays `returned`.
 * - credit, no fault found: the case closes and the unit stays `returned`.
 */
export async function closeServiceCase(
  id: string,
  input: ServiceCaseCloseInput,
  actor: Actor,
  now = new Date(),
): Promise<ServiceCaseDto> {
  return withTransaction(async (transaction) => {
    const sc = await lockOpenCase(id, transaction)
    const unit = (await Unit.findByPk(sc.unitId, { transaction, lock: transaction.LOCK.UPDATE }))!
    let replacementUnitId: string | null = null
    let reworkToStepId: string | null = null
    let replacementShipment: string | null = null
    if (input.resolution === 'repair') {
      if (unit.state !== 'returned')
        throw AppError.conflict(
          'unit_not_returned',
          `${unit.serial} is ${stateWords(unit.state)}; only a returned unit goes back for repair`,
        )
      const lot = (await Lot.findByPk(unit.lotId, { transaction, lock: transaction.LOCK.UPDATE }))!
      const last = await RouteStep.max<number, RouteStep>('position', {
        where: { revisionId: lot.revisionId },
        transaction,
      })
      const target = await reworkTarget(
        input.reworkToStepId,
        lot.revisionId,
        last,
        transaction,
        'choose the step of this unit’s route the repair starts at',
      )
      await sendToRework(unit, target, last, transaction)
      reworkToStepId = target.id
      if (lot.status === 'closed') {
        await lot.update({ status: 'in_progress', closedAt: null }, { transaction })
        await auditAction(
          actor,
          'lot.reopen',
          lot.id,
          {
            before: { status: 'closed' },
            after: { status: 'in_progress', reason: `repair of ${unit.serial} (${sc.number})` },
          },
          transaction,
        )
      }
    } else if (input.resolution === 'replace') {
      if (!input.replacementSerial)
        throw AppError.badRequest('replacementSerial: scan the serial that replaces it', {
          replacementSerial: 'scan the serial that replaces it',
        })
      const serial = codeFromScan(input.replacementSerial)
      if (serial === unit.serial)
        throw AppError.badRequest('replacementSerial: a unit cannot replace itself', {
          replacementSerial: 'a unit cannot replace itself',
        })
      if (!sc.customerId)
        throw AppError.conflict('no_customer', `${sc.number} names no customer to ship to`)
      const replacement = await Unit.findOne({ where: { serial }, transaction })
      if (!replacement)
        throw AppError.badRequest(`replacementSerial: no unit ${serial}`, {
          replacementSerial: 'no such unit',
        })
      if (replacement.state !== 'passed')
        throw AppError.conflict(
          'replacement_not_passed',
          `${serial} is ${stateWords(replacement.state)}: a replacement must have passed its whole route`,
          { replacementSerial: `${stateWords(replacement.state)}, not passed` },
        )
      const shipment = await createShipment(
        {
          customerId: sc.customerId,
          orderRef: `Replacement for ${sc.number}`,
          carrier: '',
          tracking: '',
          shippedOn: now.toISOString().slice(0, 10),
          serials: [serial],
        },
        actor,
        transaction,
      )
      replacementUnitId = replacement.id
      replacementShipment = shipment.number
    }
    await sc.update(
      {
        status: 'closed',
        resolution: input.resolution,
        reworkToStepId,
        replacementUnitId,
        closedBy: actor.id,
        closedAt: now,
      },
      { transaction },
    )
    await auditAction(
      actor,
      'service_case.close',
      id,
      {
        at: now,
        before: { status: 'open', unitState: 'returned' },
        after: {
          status: 'closed',
          serial: unit.serial,
          resolution: input.resolution,
          reworkToStepId,
          replacementSerial: input.resolution === 'replace' ? input.replacementSerial : null,
          replacementShipment,
          unitState: unit.state,
        },
      },
      transaction,
    )
    return getServiceCase(id, transaction)
  })
}
