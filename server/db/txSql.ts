import type { ClientBase, QueryResultRow } from 'pg'
import type { Transaction } from 'sequelize'

/**
 * Runs one SQL statement on the connection a Sequelize transaction holds, without the ORM's
 * per-query work (model building, cloning, hooks). For hot paths only, such as recording a
 * scan; the statement is part of the transaction and commits or rolls back with it.
 */
export async function txQuery<R extends QueryResultRow>(
  transaction: Transaction,
  text: string,
  values: unknown[],
): Promise<R[]> {
  const client = (transaction as unknown as { connection?: ClientBase }).connection
  if (!client) throw new Error('txQuery: the transaction holds no connection')
  return (await client.query<R>(text, values)).rows
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
