import type { SystemStatusDto } from '@shared/schemas/status'
import { request } from './client'

export const statusApi = {
  /** Admin only: services, job queues, failed e-mails and users' last sign-in. */
  get: () => request<SystemStatusDto>('/status'),
}
