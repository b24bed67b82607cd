import pg from 'pg'
import { env, requireSetting } from '../env'

let pool: pg.Pool | undefined

/**
 * A plain pg pool beside Sequelize's, for statements that need no ORM and no transaction of
 * their own: the session store, the session user, and the scan's unlocked fast path.
 */
export function sqlPool(): pg.Pool {
  pool ??= new pg.Pool({
    connectionString: requireSetting(env.databaseUrl, 'the database URL'),
    max: 10,
  })
  return pool
}

/** Closes the plain pool (on shutdown, and between test files). */
export async function closeSqlPool(): Promise<void> {
  await pool?.end()
  pool = undefined
}
