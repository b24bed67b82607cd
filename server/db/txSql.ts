import type { ClientBase, QueryResultRow } from 'pg'
import type { Transaction } from 'sequelize'

/**
 * A statement of a hot path. Its name makes each connection prepare it once: PostgreSQL then
 * skips parsing and, after a few runs, planning, which cost more than running these statements.
 */
export interface NamedSql {
  name: string
  text: string
}

/** A statement to prepare once per connection under `name` (unique across the app). */
export const namedSql = (name: string, text: string): NamedSql => ({ name, text })

/**
 * Runs one prepared statement on the connection a Sequelize transaction holds, without the ORM's
 * per-query work (model building, cloning, hooks). For hot paths only, such as recording a
 * scan; the statement is part of the transaction and commits or rolls back with it.
 */
export async function txQuery<R extends QueryResultRow>(
  transaction: Transaction,
  sql: NamedSql,
  values: unknown[],
): Promise<R[]> {
  const client = (transaction as unknown as { connection?: ClientBase }).connection
  if (!client) throw new Error('txQuery: the transaction holds no connection')
  return (await client.query<R>({ name: sql.name, text: sql.text, values })).rows
}

/** Whether `err` is PostgreSQL's unique violation on the named constraint. */
export function isUniqueViolation(err: unknown, constraint: string): boolean {
  const e = err as {
    code?: string
    constraint?: string
    parent?: { code?: string; constraint?: string }
  }
  const pgErr = e?.parent ?? e
  return pgErr?.code === '23505' && pgErr.constraint === constraint
}
