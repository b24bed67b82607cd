import type { LabelLayoutKey } from '@shared/lots'
import type {
  DocumentDto,
  LotCreateInput,
  LotDto,
  LotGridDto,
  LotUpdateInput,
  UnitSummaryDto,
} from '@shared/schemas/lots'
import { json, request } from './client'

const lotPath = (id: string, rest = '') => `/lots/${encodeURIComponent(id)}${rest}`

/** What a lead asks the document workers to make for a lot. */
export type DocumentRequest =
  { kind: 'labels'; layout: LabelLayoutKey } | { kind: 'travelers' } | { kind: 'lot_report' }

/** Who a finished document is e-mailed to, and an optional note above it. */
export interface DocumentEmailRequest {
  to: string[]
  note?: string
}

export const lotsApi = {
  /** Every lot, newest first, with its unit counts per state. */
  list: () => request<LotDto[]>('/lots'),
  get: (id: string) => request<LotDto>(lotPath(id)),
  /** Lead only; the number is generated when left out. 409 `duplicate` with `fields.number`. */
  create: (input: LotCreateInput) => request<LotDto>('/lots', json('POST', input)),
  /** Lead only, while the lot is planned. */
  update: (id: string, input: LotUpdateInput) => request<LotDto>(lotPath(id), json('PATCH', input)),
  /** Allocates the serials and queues travelers and labels; 409 when it is not planned. */
  release: (id: string) => request<LotDto>(lotPath(id, '/release'), json('POST', {})),
  /** Stops every unit of the lot at the stations; the reason is shown on the Floor. */
  hold: (id: string, reason: string) =>
    request<LotDto>(lotPath(id, '/hold'), json('POST', { reason })),
  unhold: (id: string, reason: string) =>
    request<LotDto>(lotPath(id, '/unhold'), json('POST', { reason })),
  /** 409 while any unit is still on its route. */
  close: (id: string) => request<LotDto>(lotPath(id, '/close'), json('POST', {})),
  /** Unit × step grid and WIP per station. */
  grid: (id: string) => request<LotGridDto>(lotPath(id, '/grid')),
  units: (id: string) => request<UnitSummaryDto[]>(lotPath(id, '/units')),
  documents: (id: string) => request<DocumentDto[]>(lotPath(id, '/documents')),
  /** Queues a PDF; answers 201 with the document in `queued`. */
  requestDocument: (id: string, input: DocumentRequest) =>
    request<DocumentDto>(lotPath(id, '/documents'), json('POST', input)),
  /** E-mails a finished document (the mail queue sends it; the Outbox shows it). */
  emailDocument: (documentId: string, input: DocumentEmailRequest) =>
    request<unknown>(`/documents/${encodeURIComponent(documentId)}/email`, json('POST', input)),
  /** Where the browser downloads a finished document. */
  documentFileUrl: (documentId: string) => `/api/documents/${encodeURIComponent(documentId)}/file`,
}
