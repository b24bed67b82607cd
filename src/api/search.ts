import type { SearchResultsDto } from '@shared/schemas/search'
import { request } from './client'

export const searchApi = {
  /** Everyone signed in: records matching `q`, of the kinds the role may read, grouped by kind. */
  find: (q: string) => request<SearchResultsDto>(`/search?${new URLSearchParams({ q })}`),
}
