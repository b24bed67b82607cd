import type { EmailDto, OutboxPageDto, OutboxQuery } from '@shared/schemas/outbox'
import type { DraftUpdateInput } from '@shared/schemas/trace'
import { json, request } from './client'

export const outboxApi = {
  /** Admin and service: one page of e-mails, newest first; no status means every status. */
  list: (query: OutboxQuery) => {
    const params = new URLSearchParams({
      page: String(query.page),
      pageSize: String(query.pageSize),
    })
    if (query.status) params.set('status', query.status)
    return request<OutboxPageDto>(`/outbox?${params}`)
  },
  /** One e-mail with its bodies and the list of its attachments. */
  get: (id: string) => request<EmailDto>(`/outbox/${encodeURIComponent(id)}`),
  /** Service, admin: change the subject or text of a draft. */
  updateDraft: (id: string, input: DraftUpdateInput) =>
    request<EmailDto>(`/outbox/${encodeURIComponent(id)}`, json('PATCH', input)),
  /** Service, admin: send a reviewed draft (it becomes queued). */
  sendDraft: (id: string) =>
    request<EmailDto>(`/outbox/${encodeURIComponent(id)}/send`, json('POST')),
  /** Admin, service: send a failed e-mail again (it becomes queued); 409 unless it failed. */
  retry: (id: string) => request<EmailDto>(`/outbox/${encodeURIComponent(id)}/retry`, json('POST')),
  /** Where the browser downloads an attachment; the server always sends it as a download. */
  attachmentUrl: (id: string, index: number) =>
    `/api/outbox/${encodeURIComponent(id)}/attachments/${index}`,
}
