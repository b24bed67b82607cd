import type {
  ComponentLotCreateInput,
  ComponentLotDto,
  ComponentLotInspectionInput,
  ComponentLotQuery,
  ComponentLotStatusInput,
  ComponentLotUpdateInput,
  PageDto,
} from '@shared/schemas/componentLots'
import { ApiError, json, request } from './client'
import { toSearchParams } from './query'

const lotPath = (id: string, rest = '') => `/component-lots/${encodeURIComponent(id)}${rest}`

/** What the server's size and type refusals mean to the person uploading. */
const UPLOAD_REFUSALS: Record<number, string> = {
  413: 'The file is larger than 10 MB. Scan the certificate at a lower resolution and try again.',
  415: 'Only PDF, PNG or JPEG files can be kept as a certificate.',
}

export const componentLotsApi = {
  /** One page of lots, sorted and filtered on the server. */
  list: (query: Partial<ComponentLotQuery>) =>
    request<PageDto<ComponentLotDto>>(`/component-lots?${toSearchParams(query)}`),
  get: (id: string) => request<ComponentLotDto>(lotPath(id)),
  /** Stores only; the server assigns the internal code. */
  create: (input: ComponentLotCreateInput) =>
    request<ComponentLotDto>('/component-lots', json('POST', input)),
  update: (id: string, input: ComponentLotUpdateInput) =>
    request<ComponentLotDto>(lotPath(id), json('PATCH', input)),
  /** Moves the lot along LOT_STATUS_MOVES; the reason goes into the audit log. */
  setStatus: (id: string, input: ComponentLotStatusInput) =>
    request<ComponentLotDto>(lotPath(id, '/status'), json('POST', input)),
  /**
   * Stores' decision on a lot awaiting incoming inspection; accepting needs its certificate
   * (400 with `fields.certificate` otherwise).
   */
  inspect: (id: string, input: ComponentLotInspectionInput) =>
    request<ComponentLotDto>(lotPath(id, '/inspection'), json('POST', input)),
  /**
   * Stores the supplier's certificate (PDF, PNG or JPEG, at most 10 MB), replacing any earlier one.
   * @throws ApiError; 413 and 415 carry a message a person can act on
   */
  async uploadCertificate(id: string, file: File): Promise<ComponentLotDto> {
    const body = new FormData()
    body.append('file', file, file.name)
    try {
      return await request<ComponentLotDto>(lotPath(id, '/certificate'), { method: 'PUT', body })
    } catch (err) {
      const refusal = err instanceof ApiError ? UPLOAD_REFUSALS[err.status] : undefined
      throw refusal && err instanceof ApiError
        ? new ApiError(err.status, err.code, refusal, err.fields)
        : err
    }
  },
  /** Where the browser opens the stored certificate. */
  certificateUrl: (id: string) => `/api${lotPath(id, '/certificate')}`,
  /** Where the browser opens the lot's label, a PDF made on request. */
  labelUrl: (id: string) => `/api${lotPath(id, '/label.pdf')}`,
}
