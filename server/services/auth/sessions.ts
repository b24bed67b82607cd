import { QueryTypes } from 'sequelize'
import { db } from '../../models'

/** Deletes expired sessions and returns how many went. */
export async function sweepExpiredSessions(now: Date): Promise<number> {
  const rows = await db().query<{ sid: string }>(
    'DELETE FROM sessions WHERE expire < :now RETURNING sid',
    {
      replacements: { now },
      type: QueryTypes.SELECT,
    },
  )
  return rows.length
}
