import type { EmailSummaryDto } from './outbox'
import type { UserAdminDto } from './users'

/** The services Waymark needs, as the status page lists them. */
export const STATUS_SERVICES = ['postgres', 'redis', 'storage', 'smtp'] as const
export type StatusService = (typeof STATUS_SERVICES)[number]

export const STATUS_SERVICE_LABELS: Record<StatusService, string> = {
  postgres: 'PostgreSQL',
  redis: 'Redis',
  storage: 'File storage (S3)',
  smtp: 'Mail relay (SMTP)',
}

/** What one service answered: up, not answering, or not set up on this installation. */
export type ServiceState = 'ok' | 'down' | 'not_configured'

export interface ServiceStatusDto {
  service: StatusService
  label: string
  state: ServiceState
  /** What an admin should know beside the state, e.g. the reason it is down. */
  detail: string
}

/** The jobs of one background queue, by where they stand; null counts when Redis did not answer. */
export interface QueueStatusDto {
  name: string
  label: string
  waiting: number | null
  active: number | null
  delayed: number | null
  failed: number | null
}

/** `GET /api/status`: the admin's home. */
export interface SystemStatusDto {
  checkedAt: string
  version: string
  services: ServiceStatusDto[]
  queues: QueueStatusDto[]
  /** The most recent e-mails given up after their last attempt, newest first. */
  failedEmails: EmailSummaryDto[]
  failedEmailTotal: number
  /** Every account, most recent sign-in first, those never signed in last. */
  users: UserAdminDto[]
}
