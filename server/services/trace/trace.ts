import { codeFromScan } from '../../../shared/links'
import { oneSlipCandidates, serialParts } from '../../../shared/serialSuggestions'
import { isValidSerial, looksLikeSerial } from '../../../shared/serials'
import type {
  TraceConsumptionDto,
  TraceDocumentDto,
  TraceNonconformanceDto,
  TraceServiceCaseDto,
  TraceStepRunDto,
  UnitTraceDto,
} from '../../../shared/schemas/trace'
import { AppError } from '../../errors'
import { UNIT_TRACE_SQL } from './traceQueries'
import { select } from '../../db/sql'

/** At most this many serials are offered for a mistyped one. */
export const SUGGESTION_MAX = 5

interface TraceRow {
  id: string
  serial: string
  state: UnitTraceDto['unit']['state']
  hold_reason: string
  rework_count: number
  created_at: Date
  finished_at: Date | null
  current_step_name: string | null
  lot_id: string
  lot_number: string
  order_ref: string
  lot_released_at: Date | null
  lot_customer_name: string
  product_id: string
  product_code: string
  product_name: string
  revision_id: string
  revision_letter: string
  revision_status: string
  revision_released_at: Date | null
  shipment_id: string | null
  shipment_number: string | null
  shipment_order_ref: string | null
  carrier: string | null
  tracking: string | null
  shipped_on: string | null
  shipment_customer_id: string | null
  shipment_customer_name: string | null
  shipment_customer_email: string | null
  step_runs: TraceStepRunDto[]
  consumptions: Omit<TraceConsumptionDto, 'certificateUrl'>[]
  nonconformances: TraceNonconformanceDto[]
  documents: Omit<TraceDocumentDto, 'url'>[]
  service_cases: TraceServiceCaseDto[]
}

const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString())

/**
 * Real serials near a mistyped one: first those one slip away (a substituted character or two
 * swapped neighbours) that exist, then the nearest sequence numbers of the same product and
 * week. Two indexed queries on units.serial.
 */
export async function serialSuggestions(typed: string): Promise<string[]> {
  const out: string[] = []
  const candidates = oneSlipCandidates(typed)
  if (candidates.length) {
    const rows = await select<{ serial: string }>(
      'SELECT serial FROM units WHERE serial IN (:candidates)',
      { replacements: { candidates } },
    )
    const existing = new Set(rows.map((r) => r.serial))
    out.push(...candidates.filter((c) => existing.has(c)))
  }
  const parts = serialParts(typed)
  if (parts && out.length < SUGGESTION_MAX) {
    const prefix = `${parts.productCode}-${parts.yearWeek}-`
    const rows = await select<{ serial: string }>(
      `SELECT serial FROM units
       WHERE serial >= :low AND serial < :high
       ORDER BY abs(substr(serial, :at, 5)::int - :sequence), serial
       LIMIT :limit`,
      {
        replacements: {
          low: prefix,
          high: `${prefix}999999`,
          at: prefix.length + 1,
          sequence: parts.sequence,
          limit: SUGGESTION_MAX * 2,
        },
      },
    )
    for (const r of rows) if (!out.includes(r.serial)) out.push(r.serial)
  }
  return out.slice(0, SUGGESTION_MAX)
}

/** The 422 for a serial whose check character is wrong, with the nearest real serials. */
async function mistyped(serial: string): Promise<AppError> {
  const suggestions = await serialSuggestions(serial)
  const offer = suggestions.length
    ? `; did you mean ${suggestions.join(', ')}?`
    : '; scan the traveler or type it again'
  return new AppError(
    422,
    'serial_mistyped',
    `${serial} was mistyped: its last character is not the right check character${offer}`,
    { serial: 'mistyped' },
    { suggestions },
  )
}

function toTrace(row: TraceRow): UnitTraceDto {
  return {
    unit: {
      id: row.id,
      serial: row.serial,
      state: row.state,
      holdReason: row.hold_reason,
      reworkCount: row.rework_count,
      currentStepName: row.current_step_name,
      createdAt: iso(row.created_at)!,
      finishedAt: iso(row.finished_at),
    },
    lot: {
      id: row.lot_id,
      number: row.lot_number,
      orderRef: row.order_ref,
      customerName: row.lot_customer_name,
      releasedAt: iso(row.lot_released_at),
    },
    product: { id: row.product_id, code: row.product_code, name: row.product_name },
    revision: {
      id: row.revision_id,
      letter: row.revision_letter,
      status: row.revision_status,
      releasedAt: iso(row.revision_released_at),
    },
    stepRuns: row.step_runs.map((r) => ({
      ...r,
      startedAt: iso(r.startedAt)!,
      finishedAt: iso(r.finishedAt)!,
    })),
    consumptions: row.consumptions.map((c) => ({
      ...c,
      fittedAt: iso(c.fittedAt)!,
      certificateUrl: c.certificateFilename
        ? `/api/component-lots/${c.componentLotId}/certificate`
        : null,
    })),
    nonconformances: row.nonconformances.map((n) => ({
      ...n,
      openedAt: iso(n.openedAt)!,
      closedAt: iso(n.closedAt),
    })),
    documents: row.documents.map((d) => ({
      ...d,
      createdAt: iso(d.createdAt)!,
      url: d.status === 'done' ? `/api/documents/${d.id}/file` : null,
    })),
    shipment: row.shipment_id
      ? {
          id: row.shipment_id,
          number: row.shipment_number!,
          customerId: row.shipment_customer_id!,
          customerName: row.shipment_customer_name!,
          customerEmail: row.shipment_customer_email ?? '',
          orderRef: row.shipment_order_ref ?? '',
          carrier: row.carrier ?? '',
          tracking: row.tracking ?? '',
          shippedOn: row.shipped_on!,
        }
      : null,
    serviceCases: row.service_cases.map((s) => ({ ...s, closedAt: iso(s.closedAt) })),
    generatedAt: new Date().toISOString(),
  }
}

/**
 * The whole history of the unit a scan names (bare serial or traveler URL), in one query.
 * A serial with a wrong check character is a 422 `serial_mistyped` offering real serials; a
 * well-formed serial that does not exist is a 404.
 */
export async function traceUnit(scanned: string): Promise<UnitTraceDto> {
  const serial = codeFromScan(scanned)
  const [row] = await select<TraceRow>(UNIT_TRACE_SQL, {
    bind: [serial],
  })
  if (row) return toTrace(row)
  if (looksLikeSerial(serial) && !isValidSerial(serial)) throw await mistyped(serial)
  throw new AppError(404, 'unknown_serial', `no unit has the serial ${serial}`, {
    serial: 'unknown',
  })
}
