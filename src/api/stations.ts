import type { StationCreateInput, StationDto, StationUpdateInput } from '@shared/schemas/stations'
import { json, request } from './client'

export const stationsApi = {
  /** Every station, active or not. */
  list: () => request<StationDto[]>('/stations'),
  /** Admin only; 409 `duplicate` with `fields.code` when the code is taken. */
  create: (input: StationCreateInput) => request<StationDto>('/stations', json('POST', input)),
  /** Admin only. */
  update: (id: string, input: StationUpdateInput) =>
    request<StationDto>(`/stations/${encodeURIComponent(id)}`, json('PATCH', input)),
}
