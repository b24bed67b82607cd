import type { PartDto, PartInput } from '@shared/schemas/recipes'
import type { PageDto, PartQuery } from '@shared/schemas/componentLots'
import { json, request } from './client'
import { toSearchParams } from './query'

export const partsApi = {
  /** One page of parts matching `q` (part number or description). */
  list: (query: Partial<PartQuery>) => request<PageDto<PartDto>>(`/parts?${toSearchParams(query)}`),
  /** Engineer or stores; 409 `duplicate` with `fields.partNumber`. */
  create: (input: PartInput) => request<PartDto>('/parts', json('POST', input)),
  update: (id: string, input: Partial<PartInput>) =>
    request<PartDto>(`/parts/${encodeURIComponent(id)}`, json('PATCH', input)),
}
