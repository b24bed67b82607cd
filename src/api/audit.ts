import type { AuditPageDto } from '@shared/schemas/audit'
import { request } from './client'

/** Query of the audit log; empty filters are left out of the URL. */
export interface AuditQuery {
  page: number
  pageSize: number
  entity?: string
  action?: string
  actor?: string
}

export const auditApi = {
  /** Admin only: one page of audit events, newest first. */
  list: (query: AuditQuery) => {
    const params = new URLSearchParams()
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params.set(key, String(value))
    }
    return request<AuditPageDto>(`/audit-events?${params}`)
  },
}
