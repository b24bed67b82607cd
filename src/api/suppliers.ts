import type { SupplierDto, SupplierQuery } from '@shared/schemas/suppliers'
import { request } from './client'
import { toSearchParams } from './query'

export const suppliersApi = {
  /** Suppliers whose name holds `q`, the exact name first, then the most used. */
  list: (query: Partial<SupplierQuery>) =>
    request<SupplierDto[]>(`/suppliers?${toSearchParams(query)}`),
}
