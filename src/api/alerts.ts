import type { AlertDto, AlertQuery, AlertsAcknowledgedDto } from '@shared/schemas/alerts'
import { json, request } from './client'
import { toSearchParams } from './query'

export const alertsApi = {
  /** Lead, engineer or admin: open alerts first, newest first. */
  list: (query: AlertQuery) => request<AlertDto[]>(`/alerts?${toSearchParams(query)}`),
  /** Lead only; 409 `alert_acknowledged` when someone acknowledged it first. */
  acknowledge: (id: string) =>
    request<AlertDto>(`/alerts/${encodeURIComponent(id)}/acknowledge`, json('POST')),
  /** Lead only: every open alert, or every open alert of one lot. */
  acknowledgeAll: (lotId?: string) =>
    request<AlertsAcknowledgedDto>('/alerts/acknowledge', json('POST', lotId ? { lotId } : {})),
}
