import { QueryTypes } from 'sequelize'
import { db } from '../../../server/models'

/**
 * Tables whose rows change without any request of the test changing data: the session store
 * writes a session's expiry on every request it answers.
 */
const IGNORED = new Set(['sessions'])

let statement: Promise<string> | undefined

/** One statement that counts every app table, with the newest `updated_at` where there is one. */
async function snapshotSql(): Promise<string> {
  const tables = await db().query<{ name: string; has_updated: boolean }>(
    `SELECT t.table_name AS name,
            EXISTS (SELECT 1 FROM information_schema.columns c
                     WHERE c.table_schema = 'public' AND c.table_name = t.table_name
                       AND c.column_name = 'updated_at') AS has_updated
       FROM information_schema.tables t
      WHERE t.table_schema = 'public' AND t.table_type = 'BASE TABLE'
      ORDER BY 1`,
    { type: QueryTypes.SELECT },
  )
  const used = tables.filter((t) => !IGNORED.has(t.name))
  if (used.length < 10) throw new Error(`only ${used.length} tables found: is the database set up?`)
  return used
    .map(
      (t) =>
        `SELECT '${t.name}' AS name, count(*)::text || ' ' || ${
          t.has_updated ? `coalesce(max(updated_at)::text, '-')` : `'-'`
        } AS state FROM "${t.name}"`,
    )
    .join(' UNION ALL ')
}

/**
 * The row count of every app table (and its newest `updated_at`), as `table → "count newest"`:
 * two snapshots that differ mean a request wrote, deleted or updated a row.
 */
export async function tableSnapshot(): Promise<Record<string, string>> {
  statement ??= snapshotSql()
  const rows = await db().query<{ name: string; state: string }>(await statement, {
    type: QueryTypes.SELECT,
  })
  return Object.fromEntries(rows.map((r) => [r.name, r.state]))
}
