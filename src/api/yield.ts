import type {
  LotTurnDeviationDto,
  LotYieldDetailDto,
  LotYieldDto,
  YieldSummaryDto,
  YieldSummaryQuery,
} from '@shared/schemas/yield'
import { request } from './client'
import { toSearchParams } from './query'

const lotPath = (id: string, rest = '') => `/yield/lots/${encodeURIComponent(id)}${rest}`

export const yieldApi = {
  /** KPIs and the lots table of a period, filtered and sorted by the server. */
  summary: (query: Record<keyof YieldSummaryQuery, string>) =>
    request<YieldSummaryDto>(`/yield/summary?${toSearchParams(query)}`),
  /** Step FPYs with intervals, RTY, lot FPY, final yield and DPU of one lot. */
  lot: (id: string) => request<LotYieldDto>(lotPath(id)),
  /** Pareto of defect codes, WIP per station and the daily failure p-chart of one lot. */
  detail: (id: string) => request<LotYieldDetailDto>(lotPath(id, '/detail')),
  /** Turn-count deviation of every winding of the lot with magnetics data. */
  turns: (id: string) => request<LotTurnDeviationDto>(lotPath(id, '/turns')),
}
