import pg from 'pg'
import { CONNECT_TIMEOUT_MS, env, requireSetting } from '../env'
import { logger } from '../logger'

let pool: pg.Pool | undefined

export { CONNECT_TIMEOUT_MS }

/**
 * A plain pg pool beside Sequelize's, for statements that need no ORM and no transaction of
 * their own: the session store, the session user, and the scan's unlocked fast path.
 */
export function sqlPool(): pg.Pool {
  if (pool) return pool
  pool = new pg.Pool({
    connectionString: requireSetting(env.databaseUrl, 'the database URL'),
    max: 10,
    // Every statement prepared on this pool (the scan's, the session user's) is a look-up by
    // index, written so that one plan serves any values. Left to choose, PostgreSQL planned the
    // scan's batched statements afresh on every run (a plan for the exact array sizes always
    // looks cheaper than the general one): 0.4–0.6 ms of planning a statement by EXPLAIN, more
    // than running it. And a general plan made while a table was still small (a new database, a
    // lot just released) scanned it whole, and went on doing so as it grew, since a kept plan is
    // not made again until the table's statistics change: so no sequential scan where an index
    // serves. Unnamed statements, such as the session store's, are planned for their values.
    options: '-c plan_cache_mode=force_generic_plan -c enable_seqscan=off',
    // While the database is away a request fails within seconds with a 503 rather than waiting:
    // for a connection (a refused one fails at once; a lost network would not), and for the reply
    // to a statement, all of which are look-ups that take milliseconds.
    connectionTimeoutMillis: CONNECT_TIMEOUT_MS,
    query_timeout: 10_000,
    keepAlive: true,
  })
  // An idle connection that the server drops (a restart, pg_terminate_backend) is reported here;
  // with no listener that would end the process. The pool has already let it go, and the next
  // query opens a new one.
  pool.on('error', (err) => logger.warn({ err: err.message }, 'database connection lost (idle)'))
  return pool
}

/** Closes the plain pool (on shutdown, and between test files). */
export async function closeSqlPool(): Promise<void> {
  await pool?.end()
  pool = undefined
}
