import type { AuditPageDto } from '@shared/schemas/audit'
import { request } from './client'

/** Filters of the audit log; empty ones are left out of the URL. */
export interface AuditFilterQuery {
  actorId?: string
  entity?: string
  action?: string
  thing?: string
  from?: string
  to?: string
}

function params(query: AuditFilterQuery & { page?: number; pageSize?: number; format?: 'csv' }) {
  const search = new URLSearchParams()
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== '' && value !== null) search.set(key, String(value))
  }
  return search
}

export const auditApi = {
  /** Admin only: one page of audit events, newest first, people and records named. */
  list: (query: AuditFilterQuery & { page: number; pageSize: number }) =>
    request<AuditPageDto>(`/audit-events?${params(query)}`),
  /** The address of the same filters as a CSV download (the browser fetches it with the session). */
  csvUrl: (query: AuditFilterQuery) => `/api/audit-events?${params({ ...query, format: 'csv' })}`,
}
