import type {
  ReturnableUnitDto,
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseDto,
  ServiceCaseUpdateInput,
} from '@shared/schemas/shipping'
import { json, request } from './client'

const enc = encodeURIComponent

/** Service cases: returns from customers, their findings and how they closed. */
export const serviceCasesApi = {
  list: (query: { status?: 'open' | 'closed' } = {}) =>
    request<ServiceCaseDto[]>(`/service-cases${query.status ? `?status=${query.status}` : ''}`),
  get: (id: string) => request<ServiceCaseDto>(`/service-cases/${enc(id)}`),
  /** What a scanned serial is, before its return is logged; 404 for an unknown serial. */
  returnable: (serial: string) => request<ReturnableUnitDto>(`/service-cases/units/${enc(serial)}`),
  /** 409 `unit_not_shipped` when the serial has not shipped. */
  open: (input: ServiceCaseCreateInput) =>
    request<ServiceCaseDto>('/service-cases', json('POST', input)),
  update: (id: string, input: ServiceCaseUpdateInput) =>
    request<ServiceCaseDto>(`/service-cases/${enc(id)}`, json('PATCH', input)),
  close: (id: string, input: ServiceCaseCloseInput) =>
    request<ServiceCaseDto>(`/service-cases/${enc(id)}/close`, json('POST', input)),
}
