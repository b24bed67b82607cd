import { z } from 'zod'
import { scanText, text } from './common'
import type { DocumentKind, DocumentStatus, UnitState } from '../lots'
import { CountersignInput } from './lots'
import type { NonconformanceDto } from './lots'

/** What the Trace scan box sends: a bare serial or a traveler URL, as scanned or typed. */
export const TraceScanParam = scanText('serial', 'scan or type a serial', 300)

/** A component lot's internal code in a path (or its label URL). */
export const ComponentLotCodeParam = scanText(
  'component lot code',
  'scan or type a component lot code',
  300,
)

export const RecallQuery = z.object({ format: z.enum(['json', 'csv']).default('json') })
export type RecallQuery = z.infer<typeof RecallQuery>

/** A lead's containment of a suspect component lot. */
export const ContainInput = z.object({
  reason: text()
    .trim()
    .min(10, 'say in a sentence why the lot is contained (at least 10 characters)')
    .max(400, 'at most 400 characters'),
})
export type ContainInput = z.infer<typeof ContainInput>

/** How a containment ends: the suspect lot was found fine, or it is bad. */
export const CONTAINMENT_OUTCOMES = ['cleared', 'rejected'] as const
export type ContainmentOutcome = (typeof CONTAINMENT_OUTCOMES)[number]

/** A lead's end of a containment, once the investigation has an answer. */
export const EndContainmentInput = z.object({
  outcome: z.enum(CONTAINMENT_OUTCOMES, { error: 'choose cleared or rejected' }),
  reason: text()
    .trim()
    .min(10, 'say in a sentence what the investigation found (at least 10 characters)')
    .max(400, 'at most 400 characters'),
})
export type EndContainmentInput = z.infer<typeof EndContainmentInput>

/** What becomes of one unit held by a containment whose lot was rejected. */
export const CONTAINED_UNIT_DECISIONS = ['rework', 'scrap', 'release'] as const
export type ContainedUnitDecision = (typeof CONTAINED_UNIT_DECISIONS)[number]

export const ContainedUnitDecisionInput = z.object({
  decision: z.enum(CONTAINED_UNIT_DECISIONS, { error: 'choose rework, scrap or release' }),
  reworkToStepId: text().uuid('choose the step to rework from').nullable().default(null),
  reason: text().trim().max(2000).default(''),
  countersign: CountersignInput.nullable().default(null),
})
export type ContainedUnitDecisionInput = z.infer<typeof ContainedUnitDecisionInput>

/** A reviewer's edit of a draft e-mail before it is sent. */
export const DraftUpdateInput = z
  .object({
    subject: text().trim().min(1, 'give the e-mail a subject').max(300).optional(),
    text: text().min(1, 'the message is empty').max(20_000).optional(),
  })
  .refine((v) => v.subject !== undefined || v.text !== undefined, {
    message: 'change the subject or the text',
  })
export type DraftUpdateInput = z.infer<typeof DraftUpdateInput>

export interface TraceValueDto {
  key: string
  label: string
  unit: string | null
  kind: 'numeric' | 'boolean' | 'text' | 'choice'
  value: number | string | boolean | null
  decimals: number
  nominal: number | null
  lower: number | null
  upper: number | null
  isPass: boolean
  isDerived: boolean
}

export interface TraceStepRunDto {
  id: string
  stepId: string
  stepName: string
  stepPosition: number
  stationKind: string
  stationCode: string
  stationName: string
  operator: string
  countersignedBy: string | null
  attempt: number
  isRework: boolean
  result: 'pass' | 'fail'
  note: string
  startedAt: string
  finishedAt: string
  values: TraceValueDto[]
}

export interface TraceConsumptionDto {
  id: string
  stepRunId: string
  componentLotId: string
  internalCode: string
  partNumber: string
  partDescription: string
  supplierName: string
  supplierLotCode: string
  componentLotStatus: string
  quantity: number
  unitOfMeasure: string
  itemSerial: string | null
  refDesignators: string
  /** Download address of the supplier's certificate, or null when none was filed. */
  certificateUrl: string | null
  certificateFilename: string | null
  fittedAt: string
}

/** A nonconformance as a unit's history shows it: the lot view's, with the step run it came from. */
export type TraceNonconformanceDto = Pick<
  NonconformanceDto,
  | 'id'
  | 'stepName'
  | 'defectCode'
  | 'defectDescription'
  | 'description'
  | 'failedChecks'
  | 'disposition'
  | 'reworkToStepName'
  | 'reason'
  | 'openedBy'
  | 'decidedBy'
  | 'countersignedBy'
  | 'openedAt'
  | 'closedAt'
> & { stepRunId: string }

export interface TraceDocumentDto {
  id: string
  kind: DocumentKind
  filename: string
  status: DocumentStatus
  createdAt: string
  /** Download address once the document is done. */
  url: string | null
}

export interface TraceShipmentDto {
  id: string
  number: string
  customerId: string
  customerName: string
  customerEmail: string
  orderRef: string
  carrier: string
  tracking: string
  shippedOn: string
}

export interface TraceServiceCaseDto {
  id: string
  number: string
  status: 'open' | 'closed'
  customerName: string | null
  complaint: string
  receivedOn: string
  findings: string
  defectCode: string | null
  resolution: string | null
  replacementSerial: string | null
  openedBy: string | null
  closedAt: string | null
}

/** Everything known about one serial, in time order (GET /api/trace/units/:serial). */
export interface UnitTraceDto {
  unit: {
    id: string
    serial: string
    state: UnitState
    holdReason: string
    reworkCount: number
    currentStepName: string | null
    createdAt: string
    finishedAt: string | null
  }
  lot: {
    id: string
    number: string
    orderRef: string
    customerName: string
    releasedAt: string | null
  }
  product: { id: string; code: string; name: string }
  revision: { id: string; letter: string; status: string; releasedAt: string | null }
  stepRuns: TraceStepRunDto[]
  consumptions: TraceConsumptionDto[]
  nonconformances: TraceNonconformanceDto[]
  documents: TraceDocumentDto[]
  shipment: TraceShipmentDto | null
  serviceCases: TraceServiceCaseDto[]
  generatedAt: string
}

/**
 * Unit states a containment holds: still on the floor, finished here and not yet shipped, or
 * back from a customer for service.
 */
export const CONTAINABLE_STATES: readonly UnitState[] = [
  'queued',
  'in_progress',
  'in_rework',
  'passed',
  'returned',
]

/** Where an affected unit stands, for the recall scope. */
export const RECALL_GROUPS = ['in_progress', 'finished', 'shipped'] as const
export type RecallGroup = (typeof RECALL_GROUPS)[number]
export const RECALL_GROUP_LABELS: Record<RecallGroup, string> = {
  in_progress: 'In progress',
  finished: 'Finished, not shipped',
  shipped: 'Shipped',
}

export interface RecallUnitDto {
  unitId: string
  serial: string
  state: UnitState
  group: RecallGroup
  lotNumber: string
  customerId: string | null
  customerName: string
  shipmentNumber: string | null
  shippedOn: string | null
  quantity: number
  /** On hold because a containment holds it (of this lot or another one fitted in it). */
  isContained: boolean
}

export interface RecallCustomerDto {
  customerId: string | null
  customerName: string
  contactEmail: string
  counts: Record<RecallGroup, number>
  total: number
}

/** Every unit holding a component lot, grouped (GET /api/trace/component-lots/:code). */
export interface RecallScopeDto {
  componentLot: {
    id: string
    internalCode: string
    partNumber: string
    partDescription: string
    supplierName: string
    supplierLotCode: string
    status: string
    receivedOn: string
  }
  counts: Record<RecallGroup, number> & { total: number; scrapped: number }
  customers: RecallCustomerDto[]
  units: RecallUnitDto[]
}

export interface ContainResultDto {
  scope: RecallScopeDto
  held: string[]
  alreadyHeld: string[]
  quarantined: boolean
  drafts: { emailId: string; customerName: string; to: string; serials: string[] }[]
  /** Customers with shipped units but no contact e-mail: nobody to draft to, call them. */
  noContact: string[]
}

export interface EndContainmentResultDto {
  scope: RecallScopeDto
  outcome: ContainmentOutcome
  /** Units that went back to where they stood when they were held. */
  released: string[]
  /** Units still held, each with the reason it now shows. */
  stillHeld: { serial: string; reason: string }[]
}

/** A unit held by a containment, with what a lead may decide for it. */
export interface ContainedUnitDto {
  serial: string
  state: UnitState
  heldFromState: UnitState | null
  holdReason: string
  /** Fitted component lots that are still quarantined: until they are ended, no decision. */
  stillContainedBy: string[]
  /** Fitted component lots that were rejected, with the step they were fitted at. */
  rejectedLots: { code: string; fittedAtStep: { id: string; name: string; position: number } }[]
  /** Steps a rework may start at: at or before the first step that fitted a rejected lot. */
  reworkSteps: { id: string; name: string; position: number }[]
}
