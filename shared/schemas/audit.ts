import { z } from 'zod'
import type { AuditChange } from '../audit'
import { isoDate, PageQuery, text } from './common'

/** One row of the append-only audit log, as the Admin screen lists it: people and records named. */
export interface AuditEventDto {
  id: string
  at: string
  actorId: string | null
  actorEmail: string | null
  /** The person's name when the actor is a user still on file. */
  actorName: string | null
  action: string
  /** The action as words: "revision released". */
  actionText: string
  entity: string
  /** The kind of record as words: "component lot". */
  entityText: string
  entityId: string | null
  /** The record as a person names it (a serial, "lot L-…", a code), when it still exists. */
  entityLabel: string | null
  /** The fields that changed, before → after, as text. */
  changes: AuditChange[]
  before: unknown
  after: unknown
  ip: string | null
}

export interface AuditPageDto {
  rows: AuditEventDto[]
  total: number
}

/** Filters of the audit log (all optional) and its paging; `format=csv` exports them. */
export const AuditQuery = PageQuery.extend({
  actorId: text().uuid('not a valid person id').optional(),
  actor: text().trim().max(254, 'at most 254 characters').optional(),
  entity: text().trim().max(64, 'at most 64 characters').optional(),
  action: text().trim().max(64, 'at most 64 characters').optional(),
  thing: text().trim().max(120, 'at most 120 characters').optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  format: z.enum(['json', 'csv']).default('json'),
}).refine((q) => !q.from || !q.to || q.from <= q.to, {
  path: ['to'],
  message: 'must not be before the start day',
})
export type AuditQueryDto = z.infer<typeof AuditQuery>
