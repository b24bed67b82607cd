import type { Transaction } from 'sequelize'
import { formatSerial, isoYearWeek, SERIAL_SEQUENCE_MAX } from '../../../shared/serials'
import { AppError } from '../../errors'
import { select } from '../../db/sql'

/**
 * Takes `count` consecutive sequence numbers of the product's current ISO week and returns the
 * serials. The counter row is bumped by one upsert, which PostgreSQL serialises per row, so
 * concurrent releases get disjoint ranges; inside the caller's transaction, a rolled-back
 * release gives its numbers back.
 */
export async function allocateSerials(
  product: { id: string; code: string },
  count: number,
  at: Date,
  transaction: Transaction,
): Promise<string[]> {
  const yearWeek = isoYearWeek(at)
  const [row] = await select<{ last: number }>(
    `INSERT INTO serial_counters (product_id, year_week, last_sequence) VALUES (:productId, :yearWeek, :count)
     ON CONFLICT (product_id, year_week) DO UPDATE SET last_sequence = serial_counters.last_sequence + EXCLUDED.last_sequence
     RETURNING last_sequence AS last`,
    {
      replacements: { productId: product.id, yearWeek, count },
      transaction,
    },
  ).catch((err: unknown) => {
    // The CHECK on last_sequence fails when a week would run past 99999 units.
    if ((err as { parent?: { code?: string } }).parent?.code === '23514')
      throw AppError.conflict(
        'serials_exhausted',
        `product ${product.code} has no serial numbers left in week ${yearWeek}`,
      )
    throw err
  })
  const last = row!.last
  if (last > SERIAL_SEQUENCE_MAX)
    throw AppError.conflict('serials_exhausted', `no serial numbers left in week ${yearWeek}`)
  return Array.from({ length: count }, (_, i) =>
    formatSerial(product.code, yearWeek, last - count + 1 + i),
  )
}
