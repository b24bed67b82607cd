import type { Transaction } from 'sequelize'
import { AuditEvent } from '../../models'

/** Who is acting, as the routes pass it to services; `null` id for anonymous sign-in attempts. */
export interface Actor {
  id: string | null
  email: string | null
  ip?: string | null
  requestId?: string | null
}

export interface AuditEntry {
  action: string
  entity: string
  entityId?: string | null
  before?: unknown
  after?: unknown
}

/**
 * Appends one event to the audit log. Pass the transaction of the change it records, so that the
 * change and its audit row commit or roll back together. The scan writes its `step_run.record`
 * rows in its own batched statement (`audited` in WRITE_RUNS, stepRunSql.ts): a change to the
 * row's shape here goes there too.
 */
export async function recordAudit(
  actor: Actor,
  entry: AuditEntry,
  transaction?: Transaction,
): Promise<void> {
  await AuditEvent.create(
    {
      actorId: actor.id,
      actorEmail: actor.email,
      action: entry.action,
      entity: entry.entity,
      entityId: entry.entityId ?? null,
      before: entry.before ?? null,
      after: entry.after ?? null,
      ip: actor.ip ?? null,
      requestId: actor.requestId ?? null,
    },
    { transaction },
  )
}

/** The fields of a record that changed, as before/after pairs for the audit log. */
export function changedFields<T extends object>(before: T, after: T) {
  const b: Record<string, unknown> = {}
  const a: Record<string, unknown> = {}
  for (const key of Object.keys(after) as (keyof T & string)[]) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
      b[key] = before[key]
      a[key] = after[key]
    }
  }
  return { before: b, after: a }
}
