import { afterAll, describe, expect, it } from 'vitest'
import {
  closePlainPool,
  execute,
  namedSql,
  prepared,
  select,
  txQuery,
  withTransaction,
} from '../../server/db/sql'
import type { Transaction } from '../../server/db/sql'

// server/db/sql.ts is the one way to the database for plain SQL and transactions. These checks
// use a temporary table and one station row that they delete again.

describe('server/db/sql.ts', () => {
  afterAll(async () => {
    await closePlainPool()
  })

  it('selects rows with named replacements, and executes a statement for its effect', async () => {
    const rows = await select<{ n: number; word: string }>(
      'SELECT CAST(:n AS int) + 1 AS n, CAST(:word AS text) AS word',
      { replacements: { n: 41, word: 'lot' } },
    )
    expect(rows).toEqual([{ n: 42, word: 'lot' }])
    await expect(execute('SELECT 1')).resolves.toBeUndefined()
  })

  it('commits a transaction that resolves and rolls back one that throws', async () => {
    const seen = await withTransaction(async (transaction) => {
      await execute('CREATE TEMP TABLE sql_check (v int) ON COMMIT DROP', { transaction })
      await execute('INSERT INTO sql_check VALUES (:v)', { replacements: { v: 7 }, transaction })
      // The transaction's own connection: the hot paths' named statements run on it too.
      const viaTx = await txQuery<{ v: number }>(
        transaction,
        namedSql('sql-check-read', 'SELECT v FROM sql_check'),
        [],
      )
      const viaSelect = await select<{ v: number }>('SELECT v FROM sql_check', { transaction })
      return { viaTx, viaSelect }
    })
    expect(seen.viaTx).toEqual([{ v: 7 }])
    expect(seen.viaSelect).toEqual([{ v: 7 }])

    // A row written in a transaction that throws is gone; one that commits stays.
    const code = `SQ${Date.now().toString(36).slice(-8)}`.toUpperCase()
    const insert = (transaction: Transaction) =>
      execute(
        `INSERT INTO stations (id, code, name, kind, created_at, updated_at)
         VALUES (gen_random_uuid(), :code, 'sql check', 'winding', now(), now())`,
        { replacements: { code }, transaction },
      )
    const count = async () =>
      Number(
        (
          await select<{ n: string }>('SELECT count(*) AS n FROM stations WHERE code = :code', {
            replacements: { code },
          })
        )[0]?.n,
      )
    await expect(
      withTransaction(async (transaction) => {
        await insert(transaction)
        expect(
          await select('SELECT 1 FROM stations WHERE code = :code', {
            replacements: { code },
            transaction,
          }),
        ).toHaveLength(1)
        throw new Error('rolled back on purpose')
      }),
    ).rejects.toThrow('rolled back on purpose')
    expect(await count()).toBe(0)
    await withTransaction(insert)
    expect(await count()).toBe(1)
    await execute('DELETE FROM stations WHERE code = :code', { replacements: { code } })
  })

  it('runs a named statement on the plain pool, prepared once per connection', async () => {
    const statement = namedSql('sql-check-echo', 'SELECT $1::int * 2 AS doubled')
    expect(await prepared<{ doubled: number }>(statement, [21])).toEqual([{ doubled: 42 }])
    // Run again with other values: the prepared statement is reused, not made twice.
    expect(await prepared<{ doubled: number }>(statement, [5])).toEqual([{ doubled: 10 }])
    const [mode] = await prepared<{ mode: string }>(
      namedSql('sql-check-mode', `SELECT current_setting('plan_cache_mode') AS mode`),
      [],
    )
    // pool.ts keeps one general plan for every statement prepared on the plain pool.
    expect(mode?.mode).toBe('force_generic_plan')
  })
})
