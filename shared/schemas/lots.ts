import { z } from 'zod'
import { DISPOSITIONS, LABEL_LAYOUT_KEYS, LOT_QUANTITY_MAX } from '../lots'
import type {
  Disposition,
  DocumentKind,
  DocumentStatus,
  GridCell,
  LotStatus,
  UnitState,
} from '../lots'
import type { StationKind } from '../stations'
import type { BomLineDto, StepDto, WindingDto } from './recipes'
import type { ComponentLotDto } from './receiving'
import { patchSchema } from './common'

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'use a date like 2026-12-01')

export const LotCreateInput = z.object({
  number: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,19}$/, 'use 2 to 20 letters, digits or -')
    .optional(),
  revisionId: z.string().uuid('choose a released revision'),
  quantity: z
    .number()
    .int('whole units only')
    .min(1, `use 1 to ${LOT_QUANTITY_MAX}`)
    .max(LOT_QUANTITY_MAX, `use 1 to ${LOT_QUANTITY_MAX}`),
  orderRef: z.string().trim().max(80).default(''),
  customerName: z.string().trim().max(120).default(''),
  /** The customer record; when given, its name is copied to `customerName`. */
  customerId: z.string().uuid('choose a customer from the list').nullable().default(null),
  dueDate: isoDate.nullable().default(null),
})
export type LotCreateInput = z.infer<typeof LotCreateInput>
export const LotUpdateInput = patchSchema(LotCreateInput.omit({ number: true }))
export type LotUpdateInput = z.infer<typeof LotUpdateInput>

export const ReasonInput = z.object({
  reason: z.string().trim().min(3, 'say why (at least 3 characters)').max(500),
})

export const DocumentRequestInput = z.object({
  kind: z.enum(['travelers', 'labels', 'lot_report'], {
    error: 'choose travelers, labels or lot_report',
  }),
  layout: z.enum(LABEL_LAYOUT_KEYS).default('a4_3x8'),
})

/** A second person's sign-in, typed at the bench to countersign a step or a disposition. */
export const CountersignInput = z.object({
  email: z.string().trim().toLowerCase().email('enter the second person’s e-mail'),
  password: z.string().min(1, 'enter the second person’s password'),
})
export type CountersignInput = z.infer<typeof CountersignInput>

const checkValue = z.union([z.number().finite(), z.boolean(), z.string().max(2000), z.null()])

export const StepRunInput = z.object({
  clientEventId: z.string().uuid('clientEventId must be a UUID made by the client'),
  serial: z.string().trim().min(1, 'scan a serial').max(200),
  stationCode: z.string().trim().toUpperCase().min(1, 'which station?').max(16),
  values: z.record(z.string(), checkValue).default({}),
  consumptions: z
    .array(
      z.object({
        bomLineId: z.string().uuid(),
        code: z.string().trim().min(1, 'scan the component lot').max(200),
        itemSerial: z.string().trim().max(80).optional(),
      }),
    )
    .default([]),
  defectCodeId: z.string().uuid().nullable().default(null),
  note: z.string().trim().max(2000).default(''),
  countersign: CountersignInput.nullable().default(null),
})
export type StepRunInput = z.infer<typeof StepRunInput>

export const DispositionInput = z.object({
  disposition: z.enum(DISPOSITIONS, { error: 'choose rework, scrap or use as is' }),
  reworkToStepId: z.string().uuid().nullable().default(null),
  reason: z.string().trim().max(2000).default(''),
  countersign: CountersignInput.nullable().default(null),
})
export type DispositionInput = z.infer<typeof DispositionInput>

// --- what the API returns ---------------------------------------------------------------

export interface StepRefDto {
  id: string
  name: string
  stationKind: StationKind
  position: number
}

export interface UnitSummaryDto {
  serial: string
  state: UnitState
  currentStep: StepRefDto | null
  reworkCount: number
}

export interface DocumentDto {
  id: string
  kind: DocumentKind
  layout: string | null
  status: DocumentStatus
  progress: number
  filename: string
  size: number | null
  error: string | null
  createdAt: string
  finishedAt: string | null
}

export interface LotDto {
  id: string
  number: string
  revisionId: string
  revisionLetter: string
  productId: string
  productCode: string
  productName: string
  quantity: number
  orderRef: string
  customerName: string
  customerId: string | null
  dueDate: string | null
  status: LotStatus
  isOnHold: boolean
  holdReason: string
  releasedAt: string | null
  closedAt: string | null
  createdAt: string
  counts: Partial<Record<UnitState, number>>
}

export interface LotGridDto {
  steps: StepRefDto[]
  units: { serial: string; state: UnitState; reworkCount: number; cells: GridCell[] }[]
  wip: { stationKind: StationKind; stepName: string; units: number }[]
}

export interface StepRunResultDto {
  stepRun: { id: string; result: 'pass' | 'fail'; attempt: number }
  unit: UnitSummaryDto
  nonconformanceId: string | null
}

/** What the Floor shows after a scan. */
export interface FloorUnitDto {
  unit: UnitSummaryDto & {
    lotNumber: string
    productCode: string
    productName: string
    revisionLetter: string
    holdReason: string
  }
  /** Null when the unit can be worked here; otherwise what to tell the operator. */
  refusal: string | null
  step: StepDto | null
  bom: BomLineDto[]
  windings: WindingDto[]
}

export interface RecentRunDto {
  id: string
  serial: string
  stepName: string
  result: 'pass' | 'fail'
  attempt: number
  finishedAt: string
  operatorName: string
}

export interface NonconformanceDto {
  id: string
  serial: string
  lotNumber: string
  stepName: string
  stepPosition: number
  defectCode: string | null
  defectDescription: string | null
  description: string
  failedChecks: string[]
  /** The failed checks' labels, in route order, for people to read. */
  failedCheckLabels: string[]
  status: 'open' | 'closed'
  disposition: Disposition | null
  reworkToStepName: string | null
  reason: string
  openedBy: string | null
  decidedBy: string | null
  countersignedBy: string | null
  openedAt: string
  closedAt: string | null
}

export type FloorComponentLotDto = Pick<
  ComponentLotDto,
  'internalCode' | 'partId' | 'partNumber' | 'status' | 'isExpired' | 'quantityRemaining'
> & {
  /** Null when the lot may be fitted; otherwise why not. */
  refusal: string | null
}
