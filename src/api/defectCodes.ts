import type { DefectCodeDto, DefectCodeInput } from '@shared/schemas/recipes'
import { json, request } from './client'

export const defectCodesApi = {
  /** Every defect code, active or not. */
  list: () => request<DefectCodeDto[]>('/defect-codes'),
  /** Engineer only; 409 `duplicate` with `fields.code`. */
  create: (input: DefectCodeInput) => request<DefectCodeDto>('/defect-codes', json('POST', input)),
  update: (id: string, input: Partial<DefectCodeInput>) =>
    request<DefectCodeDto>(`/defect-codes/${encodeURIComponent(id)}`, json('PATCH', input)),
}
