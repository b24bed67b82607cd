import type pg from 'pg'
import type { QueryResultRow } from 'pg'
import { QueryTypes } from 'sequelize'
import type { QueryOptions, Transaction } from 'sequelize'
import { db } from '../models'
import { closeSqlPool, sqlPool } from './pool'
import type { NamedSql } from './txSql'

/**
 * The one way to the database for plain SQL and transactions. Models stay the way for rows; every
 * other statement, and every transaction, goes through here:
 *
 * - `select` / `execute`: statements with `:name` replacements on Sequelize's pool, inside a
 *   transaction when one is passed;
 * - `withTransaction`: a transaction on Sequelize's pool (`inTransaction` in `retry.ts` runs one
 *   again after a deadlock);
 * - `prepared` / `txQuery`: the hot paths' named, prepared statements, on the plain pg pool
 *   (`pool.ts`, one general plan each) or on the connection a transaction holds (`txSql.ts`).
 *
 * Routes and middleware never import this module; services do.
 */

export type { NamedSql } from './txSql'
export { isUniqueViolation, namedSql, txQuery } from './txSql'
export { inTransaction, isRetryableConflict, retryOnConflict } from './retry'
export type { Transaction } from 'sequelize'

/** What a plain statement may take: its replacements and the transaction it belongs to. */
export type SqlOptions = Omit<QueryOptions, 'type' | 'plain'>

/** Runs a statement that returns rows (a SELECT, or a write with RETURNING) and returns them. */
export function select<R extends object>(text: string, options: SqlOptions = {}): Promise<R[]> {
  return db().query<R>(text, { ...options, type: QueryTypes.SELECT })
}

/** Runs a statement for its effect (UPDATE, DELETE, INSERT, a lock); its rows are not read. */
export async function execute(text: string, options: SqlOptions = {}): Promise<void> {
  await db().query(text, { ...options, type: QueryTypes.RAW })
}

/** Runs `work` in one transaction on Sequelize's pool: committed if it resolves, else rolled back. */
export function withTransaction<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  return db().transaction(work)
}

/**
 * Runs a named statement on the plain pool, outside any transaction: prepared once per
 * connection, with one general plan and no sequential scan (see `pool.ts`). For hot paths
 * such as the scan's batched read and write.
 */
export async function prepared<R extends QueryResultRow>(
  sql: NamedSql,
  values: unknown[],
): Promise<R[]> {
  return (await sqlPool().query<R>({ name: sql.name, text: sql.text, values })).rows
}

/**
 * The plain pool itself, for a library that takes a pg pool (the session store). Code of ours
 * runs statements through `prepared` instead.
 */
export function plainPool(): pg.Pool {
  return sqlPool()
}

/** Closes the plain pool (on shutdown, and between test files); Sequelize's has `closeDb`. */
export function closePlainPool(): Promise<void> {
  return closeSqlPool()
}
