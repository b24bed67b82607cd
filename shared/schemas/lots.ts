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
import { isBadgeCode } from '../links'
import type { StationKind } from '../stations'
import type { BomLineDto, StepDto, WindingDto } from './recipes'
import type { ComponentLotDto } from './componentLots'
import { isoDate, patchSchema, scanText, text } from './common'

export const LotCreateInput = z.object({
  number: text()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,19}$/, 'use 2 to 20 letters, digits or -')
    .optional(),
  revisionId: text().uuid('choose a released revision'),
  quantity: z
    .number()
    .int('whole units only')
    .min(1, `use 1 to ${LOT_QUANTITY_MAX}`)
    .max(LOT_QUANTITY_MAX, `use 1 to ${LOT_QUANTITY_MAX}`),
  orderRef: text().trim().max(80).default(''),
  customerName: text().trim().max(120).default(''),
  /** The customer record; when given, its name is copied to `customerName`. */
  customerId: text().uuid('choose a customer from the list').nullable().default(null),
  dueDate: isoDate.nullable().default(null),
})
export type LotCreateInput = z.infer<typeof LotCreateInput>
export const LotUpdateInput = patchSchema(LotCreateInput.omit({ number: true }))
export type LotUpdateInput = z.infer<typeof LotUpdateInput>

export const ReasonInput = z.object({
  reason: text().trim().min(3, 'say why (at least 3 characters)').max(500),
})

export const DocumentRequestInput = z.object({
  kind: z.enum(['travelers', 'labels', 'lot_report'], {
    error: 'choose travelers, labels or lot_report',
  }),
  layout: z.enum(LABEL_LAYOUT_KEYS).default('a4_3x8'),
})

/**
 * A second person's signature at the bench, to countersign a step or a disposition: their badge
 * scanned and their PIN typed, or (the fallback) their e-mail and password. Either pair is
 * checked as a whole; a missing half is named by its own field.
 */
export const CountersignInput = z
  .object({
    badge: text().trim().toUpperCase().max(64, 'not a badge').optional(),
    pin: text()
      .regex(/^\d{4,8}$/, 'a PIN is 4 to 8 digits')
      .optional(),
    email: text().trim().toLowerCase().email('enter the second person’s e-mail').optional(),
    password: text().min(1, 'enter the second person’s password').optional(),
  })
  .superRefine((v, ctx) => {
    const missing = (path: string, message: string) =>
      ctx.addIssue({ code: 'custom', path: [path], message })
    if (v.badge !== undefined) {
      if (!isBadgeCode(v.badge)) missing('badge', 'not a badge: scan the second person’s badge')
      if (v.pin === undefined) missing('pin', 'enter the second person’s PIN')
      return
    }
    if (v.email === undefined) missing('email', 'enter the second person’s e-mail')
    if (v.password === undefined) missing('password', 'enter the second person’s password')
  })
  .transform((v): CountersignCredentials =>
    v.badge !== undefined
      ? { badge: v.badge, pin: v.pin! }
      : { email: v.email!, password: v.password! },
  )
export type CountersignInput = z.infer<typeof CountersignInput>

/** The two ways a second person proves who they are at the bench. */
export type CountersignCredentials =
  { badge: string; pin: string } | { email: string; password: string }

const checkValue = z.union([z.number().finite(), z.boolean(), text().max(2000), z.null()])

export const StepRunInput = z.object({
  clientEventId: text().uuid('clientEventId must be a UUID made by the client'),
  serial: scanText('serial', 'scan a serial'),
  stationCode: text().trim().toUpperCase().min(1, 'which station?').max(16),
  values: z.record(text(), checkValue).default({}),
  consumptions: z
    .array(
      z.object({
        bomLineId: text().uuid(),
        code: scanText('component lot code', 'scan the component lot'),
        itemSerial: text().trim().max(80).optional(),
      }),
    )
    .default([]),
  defectCodeId: text().uuid().nullable().default(null),
  note: text().trim().max(2000).default(''),
  countersign: CountersignInput.nullable().default(null),
})
export type StepRunInput = z.infer<typeof StepRunInput>

export const DispositionInput = z.object({
  disposition: z.enum(DISPOSITIONS, { error: 'choose rework, scrap or use as is' }),
  reworkToStepId: text().uuid().nullable().default(null),
  reason: text().trim().max(2000).default(''),
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

/** Units waiting for a station's kind of step, oldest first, and how many there are in all. */
export interface WaitingUnitsDto {
  total: number
  units: {
    serial: string
    lotId: string
    lotNumber: string
    productCode: string
    stepName: string
    isRework: boolean
    /** Since when it waits: its last step run, or its lot's release. */
    since: string
  }[]
}

/** Where a unit waits: its next step and the stations that work it (none when it waits nowhere). */
export interface UnitWhereDto {
  serial: string
  state: UnitState
  lotNumber: string
  stepName: string | null
  stationKind: StationKind | null
  holdReason: string | null
  stations: { code: string; name: string }[]
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
