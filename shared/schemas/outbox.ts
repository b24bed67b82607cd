import { z } from 'zod'
import { PageQuery } from './common'

/** Where an e-mail row stands: waiting for the worker, delivered, given up, or caught by the fake. */
export const EMAIL_STATUSES = ['draft', 'queued', 'sent', 'failed', 'received'] as const
export type EmailStatus = (typeof EMAIL_STATUSES)[number]

/** Mail the app sends; incoming mail would add a direction. */
export const EMAIL_DIRECTIONS = ['out'] as const
export type EmailDirection = (typeof EMAIL_DIRECTIONS)[number]

/** Query of the Outbox list. */
export const OutboxQuery = PageQuery.extend({
  status: z.enum(EMAIL_STATUSES).optional(),
})
export type OutboxQuery = z.infer<typeof OutboxQuery>

/** An attachment as stored in `emails.attachments`: the bytes live in the object store. */
export interface EmailAttachmentRecord {
  filename: string
  contentType: string
  size: number
  storageKey: string
}

/** An attachment as the Outbox shows it; its bytes come from `/api/outbox/:id/attachments/:index`. */
export interface EmailAttachmentDto {
  filename: string
  contentType: string
  size: number
}

/** One row of the Outbox list (no bodies). */
export interface EmailSummaryDto {
  id: string
  direction: EmailDirection
  status: EmailStatus
  to: string[]
  from: string
  subject: string
  attachmentCount: number
  attempts: number
  error: string | null
  related: { entity: string; id: string } | null
  createdAt: string
  sentAt: string | null
  /** When the local mail fake filed its copy of this sent message: a delivery receipt. */
  receiptAt: string | null
}

/** One e-mail with its bodies and attachments. */
export interface EmailDto extends EmailSummaryDto {
  text: string
  html: string | null
  messageId: string | null
  attachments: EmailAttachmentDto[]
}

export interface OutboxPageDto {
  rows: EmailSummaryDto[]
  total: number
}
