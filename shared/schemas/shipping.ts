import { z } from 'zod'
import type { DocumentDto } from './lots'
import type { UnitState } from '../lots'
import type { ServiceCaseResolution, ServiceCaseStatus } from '../service'
import { SERVICE_CASE_RESOLUTIONS } from '../service'
import { isScannedCode } from '../links'
import { isoDate, patchSchema, scanText, text } from './common'

const email = text().trim().toLowerCase().email('enter an e-mail address like buyer@example.com')

/** Most serials one shipment or one request may list; a pallet of a big lot fits. */
export const SHIPMENT_SERIALS_MAX = 500

// --- customers -------------------------------------------------------------------------------

export const CustomerCreateInput = z.object({
  name: text().trim().min(2, 'enter the customer’s name (at least 2 characters)').max(120),
  contactEmail: z.union([email, z.literal('')]).default(''),
  address: text().trim().max(1000, 'keep the address under 1000 characters').default(''),
})
export type CustomerCreateInput = z.infer<typeof CustomerCreateInput>
export const CustomerUpdateInput = patchSchema(CustomerCreateInput)
export type CustomerUpdateInput = z.infer<typeof CustomerUpdateInput>

export interface CustomerDto {
  id: string
  name: string
  contactEmail: string
  address: string
  lotCount: number
  shipmentCount: number
  createdAt: string
}

// --- shipments -------------------------------------------------------------------------------

export const ShipmentCreateInput = z.object({
  customerId: text().uuid('choose a customer'),
  orderRef: text().trim().max(80).default(''),
  carrier: text().trim().max(80).default(''),
  tracking: text().trim().max(120).default(''),
  shippedOn: isoDate,
  serials: z
    .array(scanText('serial', 'scan a serial').toUpperCase())
    .min(1, 'scan at least one serial')
    .max(SHIPMENT_SERIALS_MAX, `at most ${SHIPMENT_SERIALS_MAX} serials in one shipment`),
})
export type ShipmentCreateInput = z.infer<typeof ShipmentCreateInput>

/** A serial scanned at packing, checked before it is added to the shipment being built. */
export interface ShippableUnitDto {
  serial: string
  state: UnitState
  lotNumber: string
  productCode: string
  revisionLetter: string
  /** The customer the unit's lot was built for (a record), so packing can offer it first. */
  lotCustomerId: string | null
  /** That customer's name, or the lot's free-text customer when it names no record. */
  lotCustomerName: string | null
  /** Null when the unit may ship; otherwise why not. */
  refusal: string | null
}

export interface ShipmentSummaryDto {
  id: string
  number: string
  customerId: string
  customerName: string
  orderRef: string
  carrier: string
  tracking: string
  shippedOn: string
  unitCount: number
  createdBy: string | null
  createdAt: string
}

export interface ShipmentDto extends ShipmentSummaryDto {
  customerEmail: string
  units: {
    serial: string
    lotNumber: string
    productCode: string
    revisionLetter: string
    state: UnitState
  }[]
  documents: DocumentDto[]
}

// --- certificates and e-mailed documents -----------------------------------------------------

/**
 * Asking for a certificate of conformance. A unit with a return still open is only certified
 * when `confirmOpenReturn` is true: the server answers 409 `open_return` otherwise.
 */
export const CertificateRequestInput = z.object({
  confirmOpenReturn: z.boolean({ error: 'confirmOpenReturn: true or false' }).default(false),
})
export type CertificateRequestInput = z.infer<typeof CertificateRequestInput>

/** What a 409 `open_return` carries in `details.openReturns`: each unit and its open case. */
export interface OpenReturnDto {
  serial: string
  number: string
}

/** `to` left empty goes to the contact e-mail of the document's customer. */
export const DocumentEmailInput = z.object({
  to: z.array(email).max(20, 'at most 20 recipients').default([]),
  note: text().trim().max(4000).default(''),
})
export type DocumentEmailInput = z.infer<typeof DocumentEmailInput>

/** What the e-mail dialog starts from: the customer's contact, a subject and a body. */
export interface DocumentEmailDraftDto {
  to: string[]
  subject: string
  text: string
  customerName: string | null
}

// --- service cases (returns) -----------------------------------------------------------------

export const ServiceCaseCreateInput = z.object({
  serial: scanText('serial', 'scan or type the returned serial').toUpperCase(),
  complaint: text()
    .trim()
    .min(3, 'say what the customer reports (at least 3 characters)')
    .max(4000),
  receivedOn: isoDate,
})
export type ServiceCaseCreateInput = z.infer<typeof ServiceCaseCreateInput>

/** What the return dialog shows for a scanned serial before the return is logged. */
export interface ReturnableUnitDto {
  serial: string
  state: UnitState
  productCode: string
  productName: string
  revisionLetter: string
  lotNumber: string
  /** The customer of the shipment it came back from, else the lot's customer. */
  customerName: string | null
  shipmentNumber: string | null
  shippedOn: string | null
  /** Null when a return may be logged; otherwise why not (not shipped, a case already open). */
  refusal: string | null
}

export const ServiceCaseUpdateInput = z.object({
  findings: text().trim().max(8000).optional(),
  defectCodeId: text().uuid('choose a defect code').nullable().optional(),
})
export type ServiceCaseUpdateInput = z.infer<typeof ServiceCaseUpdateInput>

export const ServiceCaseCloseInput = z.object({
  resolution: z.enum(SERVICE_CASE_RESOLUTIONS, {
    error: 'choose repair, replace, credit or no fault found',
  }),
  reworkToStepId: text().uuid('choose the step the repair starts at').nullable().default(null),
  replacementSerial: text()
    .trim()
    .max(200)
    .refine((v) => v === '' || isScannedCode(v), 'not a serial')
    .toUpperCase()
    .nullable()
    .default(null),
})
export type ServiceCaseCloseInput = z.infer<typeof ServiceCaseCloseInput>

export const ServiceCaseQuery = z.object({
  status: z.enum(['open', 'closed']).optional(),
  lotId: text().uuid().optional(),
  serial: text().trim().toUpperCase().max(200).optional(),
})
export type ServiceCaseQuery = z.infer<typeof ServiceCaseQuery>

export interface ServiceCaseDto {
  id: string
  number: string
  serial: string
  unitState: UnitState
  lotId: string
  lotNumber: string
  productCode: string
  revisionId: string
  revisionLetter: string
  customerId: string | null
  customerName: string | null
  shipmentNumber: string | null
  complaint: string
  receivedOn: string
  findings: string
  defectCodeId: string | null
  defectCode: string | null
  resolution: ServiceCaseResolution | null
  reworkToStepName: string | null
  replacementSerial: string | null
  status: ServiceCaseStatus
  openedBy: string | null
  closedBy: string | null
  closedAt: string | null
  createdAt: string
}
