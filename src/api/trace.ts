import type { UnitSummaryDto } from '@shared/schemas/lots'
import type {
  ContainedUnitDecisionInput,
  ContainedUnitDto,
  ContainResultDto,
  EndContainmentInput,
  EndContainmentResultDto,
  RecallScopeDto,
  UnitTraceDto,
} from '@shared/schemas/trace'
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
  /** Lead: the investigation has an answer; cleared releases the units, rejected keeps them held. */
  endContainment: (code: string, input: EndContainmentInput) =>
    request<EndContainmentResultDto>(
      `/trace/component-lots/${enc(code)}/end-containment`,
      json('POST', input),
    ),
  /** A unit held by a containment, with the decisions open for it. */
  containedUnit: (serial: string) =>
    request<ContainedUnitDto>(`/trace/units/${enc(serial)}/containment`),
  /** Lead or engineer: rework, scrap or release a unit of a rejected lot. */
  decideContainedUnit: (serial: string, input: ContainedUnitDecisionInput) =>
    request<UnitSummaryDto>(
      `/trace/units/${enc(serial)}/containment-decision`,
      json('POST', input),
    ),
}
