import { db, Station, User } from '../../models'
import { hashPassword } from '../../services/passwords'
import { recordAudit } from '../../services/audit'
import { DEMO_PASSWORD, DEMO_USERS } from './demoUsers'
import { DEMO_STATIONS } from './demoStations'

const SEED_ACTOR = { id: null, email: 'seed@waymark', ip: null, requestId: null }

/**
 * Loads the invented Ferncastle Power scenario (DESIGN.md §10). Idempotent: users and stations
 * that exist already are left as they are. Returns false when `onlyIfEmpty` found users.
 */
export async function loadDemo({ onlyIfEmpty }: { onlyIfEmpty: boolean }): Promise<boolean> {
  if (onlyIfEmpty && (await User.count()) > 0) return false
  const passwordHash = await hashPassword(DEMO_PASSWORD)
  await db().transaction(async (transaction) => {
    for (const u of DEMO_USERS) {
      const [user, isNew] = await User.findOrCreate({
        where: { email: u.email },
        defaults: { ...u, passwordHash, lastSignInAt: null },
        transaction,
      })
      if (isNew) await recordAudit(SEED_ACTOR, { action: 'user.create', entity: 'user', entityId: user.id, after: u }, transaction)
    }
    for (const s of DEMO_STATIONS) {
      const [station, isNew] = await Station.findOrCreate({ where: { code: s.code }, defaults: s, transaction })
      if (isNew) await recordAudit(SEED_ACTOR, { action: 'station.create', entity: 'station', entityId: station.id, after: s }, transaction)
    }
  })
  return true
}
