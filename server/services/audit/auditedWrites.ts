import { UniqueConstraintError } from 'sequelize'
import type { Attributes, Model, ModelStatic, Transaction } from 'sequelize'
import { AppError } from '../../errors'
import { changedFields, recordAudit } from './audit'
import type { Actor } from './audit'

// The shapes nearly every audited write takes, so that a service states only what is its own:
// which record, which action, what it looked like before and after.

/**
 * What an audit row records of a change: the record before, after, or both, and when it happened
 * if not now (the demo seed's clock, which the caller also gives the record's own timestamps).
 */
export interface AuditChange {
  before?: unknown
  after?: unknown
  at?: Date
}

/**
 * Writes one audit row for `action` (`<entity>.<verb>`, e.g. `part.update`) on one record, in
 * the transaction of the change. The entity is the action's first part unless `entity` names
 * another (a `step.*` action is on a `route_step`).
 */
export function auditAction(
  actor: Actor,
  action: string,
  entityId: string | null,
  change: AuditChange,
  transaction?: Transaction,
  entity = action.slice(0, action.indexOf('.')),
): Promise<void> {
  return recordAudit(actor, { action, entity, entityId, ...change }, transaction)
}

/** Audits a new record, its DTO as `after` (created `at`, if not now), and hands the DTO back. */
export async function auditCreated<D>(
  actor: Actor,
  action: string,
  entityId: string,
  dto: D,
  transaction: Transaction,
  at?: Date,
): Promise<D> {
  await auditAction(actor, action, entityId, { after: dto, at }, transaction)
  return dto
}

/** A change of a record's `status` alone, as the audit log shows it. */
export function statusMove(from: string, to: string): AuditChange {
  return { before: { status: from }, after: { status: to } }
}

/**
 * Reads a record's DTO, applies a change to it, reads it again and audits only the fields that
 * changed. Returns the DTO after the change.
 */
export async function auditedUpdate<D extends object>(
  actor: Actor,
  action: string,
  entityId: string,
  transaction: Transaction,
  read: () => D | Promise<D>,
  apply: () => Promise<unknown>,
): Promise<D> {
  const before = await read()
  await apply()
  const after = await read()
  await auditAction(actor, action, entityId, changedFields(before, after), transaction)
  return after
}

/**
 * Sets `input` on a loaded record, saves it and audits the fields of its DTO that changed.
 * Returns the DTO after the change.
 */
export function updateAudited<M extends Model & { id: string }, D extends object>(
  actor: Actor,
  action: string,
  record: M,
  input: Partial<Attributes<M>>,
  toDto: (record: M) => D,
  transaction: Transaction,
): Promise<D> {
  return auditedUpdate(
    actor,
    action,
    record.id,
    transaction,
    () => toDto(record),
    () => record.update(input, { transaction }),
  )
}

/** A record by primary key for the rest of the transaction (locked with `lock`), or a 404. */
export async function findOr404<M extends Model>(
  model: ModelStatic<M>,
  id: string,
  what: string,
  transaction: Transaction,
  lock = false,
): Promise<M> {
  const row = await model.findByPk(id, {
    transaction,
    ...(lock ? { lock: transaction.LOCK.UPDATE } : {}),
  })
  if (!row) throw AppError.notFound(`${what} ${id}`)
  return row
}

/**
 * A `.catch` for a write that may hit a unique index: a 409 `duplicate` with the message and the
 * field messages given, any other error passed on unchanged.
 */
export function conflictOnDuplicate(message: string, fields: Record<string, string>) {
  return (err: unknown): never => {
    if (err instanceof UniqueConstraintError) throw AppError.conflict('duplicate', message, fields)
    throw err
  }
}
