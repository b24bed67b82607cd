import type { DocumentDto } from '@shared/schemas/lots'
import type { EmailDto } from '@shared/schemas/outbox'
import type { DocumentEmailDraftDto, DocumentEmailInput } from '@shared/schemas/shipping'
import { json, request } from './client'

const enc = encodeURIComponent

/** Generated documents (PDFs): status, download, e-mail, and a unit's papers. */
export const documentsApi = {
  get: (id: string) => request<DocumentDto>(`/documents/${enc(id)}`),
  fileUrl: (id: string) => `/api/documents/${enc(id)}/file`,
  /** The customer's contact, subject and body the e-mail dialog starts from. */
  emailDraft: (id: string) => request<DocumentEmailDraftDto>(`/documents/${enc(id)}/email-draft`),
  /** Queues the finished PDF as an attachment on the mail queue. */
  email: (id: string, input: DocumentEmailInput) =>
    request<EmailDto>(`/documents/${enc(id)}/email`, json('POST', input)),
  /** 409 `open_return` while the unit has a return open, unless `confirmOpenReturn`. */
  unitCertificate: (serial: string, confirmOpenReturn = false) =>
    request<DocumentDto>(`/units/${enc(serial)}/certificate`, json('POST', { confirmOpenReturn })),
  /** Every document of a unit (certificates, its shipment's papers, its lot's), newest first. */
  unitDocuments: (serial: string) => request<DocumentDto[]>(`/units/${enc(serial)}/documents`),
}
