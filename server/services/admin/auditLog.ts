import { actionWords, auditChanges, fieldWords } from '../../../shared/audit'
import { containsPattern } from '../../../shared/searchTerms'
import type { AuditEventDto, AuditPageDto, AuditQueryDto } from '../../../shared/schemas/audit'
import { select } from '../../db/sql'
import { labelKey, recordLabels, recordsLabelled } from './auditLabels'

/** The most rows one CSV export holds; a longer history is exported a date range at a time. */
export const AUDIT_CSV_MAX_ROWS = 20_000

interface AuditRow {
  id: string
  at: Date
  actor_id: string | null
  actor_email: string | null
  actor_name: string | null
  action: string
  entity: string
  entity_id: string | null
  before: unknown
  after: unknown
  ip: string | null
}

/** The WHERE clause and replacements of a query. */
async function whereOf(
  q: Omit<AuditQueryDto, 'page' | 'pageSize'>,
): Promise<{ sql: string; replacements: Record<string, unknown> }> {
  const parts: string[] = []
  const replacements: Record<string, unknown> = {}
  if (q.actorId) {
    parts.push('e.actor_id = :actorId')
    replacements.actorId = q.actorId
  }
  if (q.actor) {
    parts.push(`(e.actor_email ILIKE :actor OR u.name ILIKE :actor)`)
    replacements.actor = containsPattern(q.actor)
  }
  if (q.entity) {
    parts.push('e.entity = :entity')
    replacements.entity = q.entity
  }
  if (q.action) {
    parts.push('starts_with(e.action, :action)')
    replacements.action = q.action
  }
  // Days are whole UTC days, as the rest of the app reads a date.
  if (q.from) {
    parts.push(`e.at >= (:from)::date AT TIME ZONE 'UTC'`)
    replacements.from = q.from
  }
  if (q.to) {
    parts.push(`e.at < ((:to)::date + 1) AT TIME ZONE 'UTC'`)
    replacements.to = q.to
  }
  if (q.thing) {
    const records = await recordsLabelled(q.thing)
    // The id itself also finds its rows, for a record since deleted.
    const ors = ['e.entity_id = :thing']
    replacements.thing = q.thing
    records.forEach((r, i) => {
      ors.push(`(e.entity = :te${i} AND e.entity_id = :ti${i})`)
      replacements[`te${i}`] = r.entity
      replacements[`ti${i}`] = r.entityId
    })
    parts.push(`(${ors.join(' OR ')})`)
  }
  return { sql: parts.length ? `WHERE ${parts.join(' AND ')}` : '', replacements }
}

const FROM = 'FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id'

async function events(
  q: Omit<AuditQueryDto, 'page' | 'pageSize'>,
  limit: number,
  offset: number,
): Promise<{ rows: AuditEventDto[]; total: number }> {
  const where = await whereOf(q)
  const [rows, [count]] = await Promise.all([
    select<AuditRow>(
      `SELECT e.id::text AS id, e.at, e.actor_id, e.actor_email, u.name AS actor_name, e.action,
              e.entity, e.entity_id, e.before, e.after, e.ip
         ${FROM} ${where.sql}
        ORDER BY e.at DESC, e.id DESC LIMIT :limit OFFSET :offset`,
      { replacements: { ...where.replacements, limit, offset } },
    ),
    select<{ n: string }>(`SELECT count(*) AS n ${FROM} ${where.sql}`, {
      replacements: where.replacements,
    }),
  ])
  const labels = await recordLabels(rows.map((r) => ({ entity: r.entity, entityId: r.entity_id })))
  return {
    total: Number(count?.n ?? 0),
    rows: rows.map((r) => ({
      id: r.id,
      at: r.at.toISOString(),
      actorId: r.actor_id,
      actorEmail: r.actor_email,
      actorName: r.actor_name,
      action: r.action,
      actionText: actionWords(r.action),
      entity: r.entity,
      entityText: fieldWords(r.entity),
      entityId: r.entity_id,
      entityLabel: r.entity_id ? (labels.get(labelKey(r.entity, r.entity_id)) ?? null) : null,
      changes: auditChanges(r.before, r.after),
      before: r.before,
      after: r.after,
      ip: r.ip,
    })),
  }
}

/**
 * A page of the audit log, newest first, with people and records named: filtered by person (id,
 * or a part of a name or e-mail), kind of record, action prefix, a record's label (a serial, a
 * lot number, a code, a name) and a range of days.
 */
export function listAuditEvents(q: AuditQueryDto): Promise<AuditPageDto> {
  return events(q, q.pageSize, (q.page - 1) * q.pageSize)
}

/** The who of a row as read: the person's name and e-mail, or the process that acted. */
function whoText(r: AuditEventDto): string {
  if (r.actorName) return `${r.actorName} <${r.actorEmail ?? ''}>`
  return r.actorEmail ?? 'system'
}

/** A table to write as CSV: its header and its records (the route writes it with `writeCsv`). */
export interface AuditTable {
  header: string[]
  records: (string | Date | null)[][]
  isTruncated: boolean
}

/**
 * The rows of the same filters as a table for a CSV file (newest first, at most
 * `AUDIT_CSV_MAX_ROWS`): time, person, action, record and the change list as
 * "field: before → after" lines.
 */
export async function auditTable(q: Omit<AuditQueryDto, 'page' | 'pageSize'>): Promise<AuditTable> {
  const { rows, total } = await events(q, AUDIT_CSV_MAX_ROWS, 0)
  const records = rows.map((r) => [
    new Date(r.at),
    whoText(r),
    r.action,
    r.actionText,
    r.entityText,
    r.entityLabel ?? r.entityId,
    r.changes.map((c) => `${c.field}: ${c.before} → ${c.after}`).join('\n'),
    r.ip,
  ])
  const header = [
    'time (UTC)',
    'who',
    'action',
    'what happened',
    'record kind',
    'record',
    'changes',
    'from address',
  ]
  return { header, records, isTruncated: total > rows.length }
}
