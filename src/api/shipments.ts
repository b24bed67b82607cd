import type { DocumentDto } from '@shared/schemas/lots'
import type {
  ShipmentCreateInput,
  ShipmentDto,
  ShipmentSummaryDto,
  ShippableUnitDto,
} from '@shared/schemas/shipping'
import { json, request } from './client'

const enc = encodeURIComponent

/** Shipments: packing serials for a customer and their certificate. */
export const shipmentsApi = {
  list: (customerId?: string) =>
    request<ShipmentSummaryDto[]>(
      `/shipments${customerId ? `?customerId=${enc(customerId)}` : ''}`,
    ),
  get: (id: string) => request<ShipmentDto>(`/shipments/${enc(id)}`),
  /** Whether a scanned serial (bare or traveler URL) may ship; 404 for an unknown serial. */
  check: (scanned: string) => request<ShippableUnitDto>(`/shipments/units/${enc(scanned)}`),
  /** 409 `units_not_shippable` with `details` naming each refused serial; nothing is saved. */
  create: (input: ShipmentCreateInput) => request<ShipmentDto>('/shipments', json('POST', input)),
  /** 409 `open_return` while one of its units has a return open, unless `confirmOpenReturn`. */
  certificate: (id: string, confirmOpenReturn = false) =>
    request<DocumentDto>(`/shipments/${enc(id)}/certificate`, json('POST', { confirmOpenReturn })),
}
