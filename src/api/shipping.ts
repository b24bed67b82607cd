import type { DocumentDto } from '@shared/schemas/lots'
import type { EmailDto } from '@shared/schemas/outbox'
import type {
  CustomerCreateInput,
  CustomerDto,
  CustomerUpdateInput,
  DocumentEmailDraftDto,
  DocumentEmailInput,
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseDto,
  ServiceCaseUpdateInput,
  ShipmentCreateInput,
  ShipmentDto,
  ShipmentSummaryDto,
  ShippableUnitDto,
} from '@shared/schemas/shipping'
import { json, request } from './client'

const enc = encodeURIComponent

export const customersApi = {
  list: () => request<CustomerDto[]>('/customers'),
  /** Lead, service, admin; 409 `duplicate` with `fields.name` when the name is taken. */
  create: (input: CustomerCreateInput) => request<CustomerDto>('/customers', json('POST', input)),
  update: (id: string, input: CustomerUpdateInput) =>
    request<CustomerDto>(`/customers/${enc(id)}`, json('PATCH', input)),
}

export const shipmentsApi = {
  list: (customerId?: string) =>
    request<ShipmentSummaryDto[]>(
      `/shipments${customerId ? `?customerId=${enc(customerId)}` : ''}`,
    ),
  get: (id: string) => request<ShipmentDto>(`/shipments/${enc(id)}`),
  /** Whether a scanned serial (bare or traveler URL) may ship; 404 for an unknown serial. */
  check: (scanned: string) => request<ShippableUnitDto>(`/shipments/units/${enc(scanned)}`),
  /** 409 `units_not_shippable` with `details` naming each refused serial; nothing is saved. */
  create: (input: ShipmentCreateInput) => request<ShipmentDto>('/shipments', json('POST', input)),
  certificate: (id: string) =>
    request<DocumentDto>(`/shipments/${enc(id)}/certificate`, json('POST', {})),
}

export const documentsApi = {
  get: (id: string) => request<DocumentDto>(`/documents/${enc(id)}`),
  fileUrl: (id: string) => `/api/documents/${enc(id)}/file`,
  /** The customer's contact, subject and body the e-mail dialog starts from. */
  emailDraft: (id: string) => request<DocumentEmailDraftDto>(`/documents/${enc(id)}/email-draft`),
  /** Queues the finished PDF as an attachment on the mail queue. */
  email: (id: string, input: DocumentEmailInput) =>
    request<EmailDto>(`/documents/${enc(id)}/email`, json('POST', input)),
  unitCertificate: (serial: string) =>
    request<DocumentDto>(`/units/${enc(serial)}/certificate`, json('POST', {})),
  unitDocuments: (serial: string) => request<DocumentDto[]>(`/units/${enc(serial)}/documents`),
}

export const serviceCasesApi = {
  list: (query: { status?: 'open' | 'closed' } = {}) =>
    request<ServiceCaseDto[]>(`/service-cases${query.status ? `?status=${query.status}` : ''}`),
  get: (id: string) => request<ServiceCaseDto>(`/service-cases/${enc(id)}`),
  /** 409 `unit_not_shipped` when the serial has not shipped. */
  open: (input: ServiceCaseCreateInput) =>
    request<ServiceCaseDto>('/service-cases', json('POST', input)),
  update: (id: string, input: ServiceCaseUpdateInput) =>
    request<ServiceCaseDto>(`/service-cases/${enc(id)}`, json('PATCH', input)),
  close: (id: string, input: ServiceCaseCloseInput) =>
    request<ServiceCaseDto>(`/service-cases/${enc(id)}/close`, json('POST', input)),
}
