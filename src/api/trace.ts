import type { ContainResultDto, RecallScopeDto, UnitTraceDto } from '@shared/schemas/trace'
import { json, request } from './client'

const enc = encodeURIComponent

export const traceApi = {
  /** The whole history of a serial (bare or traveler URL); 422 `serial_mistyped` with suggestions. */
  unit: (serial: string) => request<UnitTraceDto>(`/trace/units/${enc(serial)}`),
  /** Where the browser downloads the unit history record. */
  historyUrl: (serial: string, format: 'pdf' | 'json') =>
    `/api/trace/units/${enc(serial)}/history.${format}`,
  /** Every unit holding a component lot, grouped. */
  recall: (code: string) => request<RecallScopeDto>(`/trace/component-lots/${enc(code)}`),
  recallCsvUrl: (code: string) => `/api/trace/component-lots/${enc(code)}?format=csv`,
  /** Lead: hold the affected units, quarantine the lot, draft the customer letters. */
  contain: (code: string, reason: string) =>
    request<ContainResultDto>(
      `/trace/component-lots/${enc(code)}/contain`,
      json('POST', { reason }),
    ),
}
