import { select } from '../../db/sql'
/** Deletes expired sessions and returns how many went. */
export async function sweepExpiredSessions(now: Date): Promise<number> {
  const rows = await select<{ sid: string }>(
    'DELETE FROM sessions WHERE expire < :now RETURNING sid',
    {
      replacements: { now },
    },
  )
  return rows.length
}
