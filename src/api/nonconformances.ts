import type { DispositionInput, NonconformanceDto } from '@shared/schemas/lots'
import { json, request } from './client'
import { toSearchParams } from './query'

export interface NonconformanceQuery {
  lotId?: string
  status?: 'open' | 'closed'
}

export const nonconformancesApi = {
  list: (query: NonconformanceQuery) =>
    request<NonconformanceDto[]>(`/nonconformances?${toSearchParams(query)}`),
  /**
   * Lead or engineer. Use as is by anyone but an engineer needs an engineer's countersign;
   * 409 when the nonconformance is closed already.
   */
  dispose: (id: string, input: DispositionInput) =>
    request<NonconformanceDto>(
      `/nonconformances/${encodeURIComponent(id)}/disposition`,
      json('POST', input),
    ),
}
