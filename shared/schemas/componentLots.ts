import { z } from 'zod'
import { COMPONENT_LOT_STATUSES } from '../recipeDefinitions'
import type { ComponentLotStatus, UnitOfMeasure } from '../recipeDefinitions'
import { isoDate, PageQuery, text } from './common'
import { supplierName } from './suppliers'

export const ComponentLotCreateInput = z
  .object({
    partId: text().uuid('choose a part'),
    /** Picked from the suggestions or typed: a name not yet on record adds the supplier. */
    supplierName: supplierName(),
    supplierLotCode: text().trim().min(1, 'enter the supplier’s lot code').max(80),
    quantityReceived: z.number().positive('quantity must be more than 0').max(1e9),
    receivedOn: isoDate,
    expiresOn: isoDate.nullable().default(null),
    notes: text().trim().max(2000).default(''),
  })
  .refine((v) => v.expiresOn === null || v.expiresOn >= v.receivedOn, {
    path: ['expiresOn'],
    message: 'the expiry date is before the date received',
  })
export type ComponentLotCreateInput = z.infer<typeof ComponentLotCreateInput>

export const ComponentLotUpdateInput = z
  .object({
    supplierName: supplierName(),
    supplierLotCode: text().trim().min(1, 'enter the supplier’s lot code').max(80),
    expiresOn: isoDate.nullable(),
    notes: text().trim().max(2000),
    quantityRemaining: z.number().min(0, 'cannot be below 0').max(1e9),
  })
  .partial()
export type ComponentLotUpdateInput = z.infer<typeof ComponentLotUpdateInput>

export const ComponentLotStatusInput = z.object({
  status: z.enum(COMPONENT_LOT_STATUSES, { error: 'choose a status' }),
  reason: text().trim().min(3, 'say why (at least 3 characters)').max(500),
})
export type ComponentLotStatusInput = z.infer<typeof ComponentLotStatusInput>

/**
 * Stores' decision on a lot awaiting incoming inspection. Accepting needs the supplier's
 * certificate attached first; either way the note says what was checked.
 */
export const ComponentLotInspectionInput = z.object({
  decision: z.enum(['accept', 'reject'], { error: 'choose accept or reject' }),
  note: text()
    .trim()
    .min(3, 'say what was checked (at least 3 characters)')
    .max(2000, 'at most 2000 characters'),
})
export type ComponentLotInspectionInput = z.infer<typeof ComponentLotInspectionInput>

/** The expiry date a shelf life suggests: the day received plus that many days. */
export function suggestedExpiry(receivedOn: string, shelfLifeDays: number | null): string | null {
  if (shelfLifeDays === null || !/^\d{4}-\d{2}-\d{2}$/.test(receivedOn)) return null
  const day = new Date(`${receivedOn}T00:00:00Z`)
  if (Number.isNaN(day.getTime())) return null
  day.setUTCDate(day.getUTCDate() + shelfLifeDays)
  return day.toISOString().slice(0, 10)
}

export const COMPONENT_LOT_SORTS = [
  'receivedOn',
  'internalCode',
  'expiresOn',
  'quantityRemaining',
] as const

export const ComponentLotQuery = PageQuery.extend({
  q: text().trim().max(80).optional(),
  partId: text().uuid().optional(),
  status: z.enum(COMPONENT_LOT_STATUSES).optional(),
  sort: z.enum(COMPONENT_LOT_SORTS).default('receivedOn'),
  order: z.enum(['asc', 'desc']).default('desc'),
})
export type ComponentLotQuery = z.infer<typeof ComponentLotQuery>

export const PART_SORTS = ['partNumber', 'description'] as const
export const PartQuery = PageQuery.extend({
  q: text().trim().max(80).optional(),
  sort: z.enum(PART_SORTS).default('partNumber'),
  order: z.enum(['asc', 'desc']).default('asc'),
})
export type PartQuery = z.infer<typeof PartQuery>

/**
 * Which status changes a person may make. `used_up` is set by the system when the remaining
 * quantity reaches 0 and lifted when a stock count puts some back; `rejected` is final.
 */
export const LOT_STATUS_MOVES: Record<ComponentLotStatus, readonly ComponentLotStatus[]> = {
  available: ['quarantined', 'rejected'],
  quarantined: ['available', 'rejected'],
  used_up: ['quarantined', 'rejected'],
  rejected: [],
}

/** Whether a lot may be fitted today: available, with stock, and not past its expiry date. */
export function isLotUsable(
  lot: { status: ComponentLotStatus; quantityRemaining: number; expiresOn: string | null },
  today: string,
): boolean {
  return (
    lot.status === 'available' &&
    lot.quantityRemaining > 0 &&
    (lot.expiresOn === null || lot.expiresOn >= today)
  )
}

export interface UploadDto {
  id: string
  filename: string
  contentType: string
  size: number
  sha256: string
}

export interface ComponentLotDto {
  id: string
  internalCode: string
  partId: string
  partNumber: string
  partDescription: string
  unitOfMeasure: UnitOfMeasure
  supplierId: string
  /** The supplier record's name. */
  supplierName: string
  supplierLotCode: string
  quantityReceived: number
  quantityRemaining: number
  receivedOn: string
  expiresOn: string | null
  isExpired: boolean
  status: ComponentLotStatus
  notes: string
  certificate: UploadDto | null
  /** Quarantined on receipt until stores accept or reject it at incoming inspection. */
  awaitsInspection: boolean
  /** When stores decided at incoming inspection (ISO timestamp), or null. */
  inspectedAt: string | null
  inspectionNote: string
}

export interface PageDto<T> {
  rows: T[]
  total: number
}
