import { db, Station, User } from '../models'
import { recordAudit } from '../services/admin'
import type { Actor } from '../services/admin'
import { hashPassword } from '../services/auth'
import { DEMO_PASSWORD, DEMO_USERS } from './demoUsers'
import { DEMO_STATIONS } from './demoStations'
import { loadDemoLots } from './demoLots'
import { loadDemoCustomers, loadDemoShipping } from './demoShipping'
import { loadMiscountLot } from './demoMiscountLot'
import { loadDemoRecipes } from './loadRecipes'
import { withTransaction } from '../db/sql'

/** The actor the audit log names for demo rows. */
export const SEED_ACTOR: Actor = { id: null, email: 'seed@waymark', ip: null, requestId: null }

/** The demo people (one per role) and stations: what a test stack that builds its own data needs. */
export async function loadPeopleAndFloor(): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD)
  await withTransaction(async (transaction) => {
    for (const u of DEMO_USERS) {
      const [user, isNew] = await User.findOrCreate({
        where: { email: u.email },
        defaults: { ...u, passwordHash, lastSignInAt: null },
        transaction,
      })
      if (isNew)
        await recordAudit(
          SEED_ACTOR,
          { action: 'user.create', entity: 'user', entityId: user.id, after: u },
          transaction,
        )
    }
    for (const s of DEMO_STATIONS) {
      const [station, isNew] = await Station.findOrCreate({
        where: { code: s.code },
        defaults: s,
        transaction,
      })
      if (isNew)
        await recordAudit(
          SEED_ACTOR,
          { action: 'station.create', entity: 'station', entityId: station.id, after: s },
          transaction,
        )
    }
  })
}

/**
 * Loads the invented Ferncastle Power scenario (DESIGN.md §10). Each part is skipped when its
 * rows exist already, so running it twice changes nothing. Returns false when `onlyIfEmpty`
 * found users.
 */
export async function loadDemo({ onlyIfEmpty }: { onlyIfEmpty: boolean }): Promise<boolean> {
  db()
  if (onlyIfEmpty && (await User.count()) > 0) return false
  await loadPeopleAndFloor()
  await loadDemoRecipes(SEED_ACTOR)
  await loadDemoCustomers()
  await loadDemoLots()
  await loadDemoShipping()
  await loadMiscountLot()
  return true
}
