import { setTimeout as sleep } from 'node:timers/promises'
import type { Transaction } from 'sequelize'
import { db } from '../models'

/** PostgreSQL's codes for a transaction it rolled back to end a lock conflict: deadlock, serialization. */
const RETRYABLE_CODES = new Set(['40P01', '40001'])

/** Whether `err` is a deadlock (40P01) or serialization failure (40001), from pg or Sequelize. */
export function isRetryableConflict(err: unknown): boolean {
  const e = err as { code?: string; parent?: { code?: string }; original?: { code?: string } }
  const code = e?.parent?.code ?? e?.original?.code ?? e?.code
  return code !== undefined && RETRYABLE_CODES.has(code)
}

/** How many times a conflict is retried; after that its error goes to the caller. */
export const CONFLICT_RETRIES = 3

/**
 * Runs `work` again when PostgreSQL ends it as the victim of a deadlock or a serialization
 * failure, at most CONFLICT_RETRIES times, after a short random pause so that the two sides do
 * not meet again in step. A safety net only: code that locks several rows takes them in one
 * order (a lot before its units, units by id), so the retry should not be needed. `work` must
 * be safe to run again after such a failure: a whole transaction, or one statement.
 */
export async function retryOnConflict<T>(work: () => Promise<T>): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await work()
    } catch (err) {
      if (attempt >= CONFLICT_RETRIES || !isRetryableConflict(err)) throw err
      await sleep(5 + Math.random() * 20 * (attempt + 1))
    }
  }
}

/** `db().transaction(work)`, run again (whole) if PostgreSQL ends it to resolve a lock conflict. */
export function inTransaction<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  return retryOnConflict(() => db().transaction(work))
}
