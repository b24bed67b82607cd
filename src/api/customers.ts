import type {
  CustomerCreateInput,
  CustomerDto,
  CustomerUpdateInput,
} from '@shared/schemas/shipping'
import { json, request } from './client'

const enc = encodeURIComponent

/** Customers: who lots are built for and shipments go to. */
export const customersApi = {
  list: () => request<CustomerDto[]>('/customers'),
  /** Lead, service, admin; 409 `duplicate` with `fields.name` when the name is taken. */
  create: (input: CustomerCreateInput) => request<CustomerDto>('/customers', json('POST', input)),
  update: (id: string, input: CustomerUpdateInput) =>
    request<CustomerDto>(`/customers/${enc(id)}`, json('PATCH', input)),
}
