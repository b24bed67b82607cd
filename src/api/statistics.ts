import type { StatisticsDto } from '@shared/schemas/statistics'
import { request } from './client'
import { toSearchParams } from './query'

export const statisticsApi = {
  /** A lot's numeric checks and, with `checkId`, that check's I-MR chart and capability. */
  lot: (lotId: string, checkId = '') =>
    request<StatisticsDto>(
      `/yield/lots/${encodeURIComponent(lotId)}/statistics?${toSearchParams({ checkId })}`,
    ),
  /** A product's checks by key across lots in a period and, with `checkKey`, one series. */
  product: (query: {
    productId: string
    revisionId: string
    from: string
    to: string
    checkKey: string
  }) => request<StatisticsDto>(`/yield/statistics?${toSearchParams(query)}`),
}
