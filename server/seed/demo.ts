import { db, Lot, Station, User } from '../models'
import { recordAudit } from '../services/admin'
import type { Actor } from '../services/admin'
import { hashPassword } from '../services/auth'
import { evaluateLotStep, lotStepsRunSince } from '../services/quality'
import { DEMO_HASH_COST, DEMO_PASSWORD, DEMO_USERS } from './demoUsers'
import { DEMO_STATIONS } from './demoStations'
import { demoAnchor, demoClock } from './demoClock'
import { demoCast } from './demoFloor'
import { SeriesMemory } from './demoReadings'
import { loadDemoCustomers } from './demoShipping'
import { loadDemoStory } from './demoStory'
import { loadDemoRecipes } from './loadRecipes'
import { withTransaction } from '../db/sql'

/** The actor the audit log names for demo rows. */
export const SEED_ACTOR: Actor = { id: null, email: 'seed@waymark', ip: null, requestId: null }

/** The demo people (one per role, two operators) and stations: what a test stack needs. */
export async function loadPeopleAndFloor(): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD, DEMO_HASH_COST)
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
 * Judges every lot step the story ran, as the alerts worker does after each scan, so the Yield
 * board is settled when the app first serves. The jobs the scans queued find nothing new to
 * raise afterwards: an alert is stored once.
 */
async function settleAlerts(anchor: Date): Promise<number> {
  let raised = 0
  const since = new Date(anchor.getTime() - 120 * 86_400_000)
  for (const { lotId, stepId } of await lotStepsRunSince(since))
    raised += (await evaluateLotStep(lotId, stepId)).raised
  return raised
}

/**
 * Loads the invented Ferncastle Power scenario (DESIGN.md §10): six weeks of working days before
 * `now`, through the services. Each part is skipped when its rows exist already, so running it
 * twice changes nothing. Returns false when `onlyIfEmpty` found users.
 */
export async function loadDemo({
  onlyIfEmpty,
  now = new Date(),
}: {
  onlyIfEmpty: boolean
  now?: Date
}): Promise<boolean> {
  db()
  if (onlyIfEmpty && (await User.count()) > 0) return false
  const anchor = demoAnchor(now)
  await loadPeopleAndFloor()
  await loadDemoRecipes(SEED_ACTOR, anchor)
  const cast = await demoCast()
  await loadDemoCustomers(cast.lead)
  if ((await Lot.count()) === 0) {
    await loadDemoStory({ clock: demoClock(anchor), cast, memory: new SeriesMemory() })
    const alerts = await settleAlerts(anchor)
    // The anchor the story's dates hang from, so a reader (or a test) can rebuild its calendar.
    await recordAudit(SEED_ACTOR, {
      action: 'demo.load',
      entity: 'demo',
      after: { anchor: anchor.toISOString(), alerts },
    })
  }
  return true
}
