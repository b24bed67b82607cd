import { db, Lot, Station, User } from '../models'
import { recordAudit } from '../services/admin'
import type { Actor } from '../services/admin'
import { hashPassword } from '../services/auth'
import { DEMO_HASH_COST, DEMO_PASSWORD, DEMO_USERS } from './demoUsers'
import { DEMO_STATIONS } from './demoStations'
import { demoAnchor, demoClock } from './demoClock'
import { DemoAlerts } from './demoAlerts'
import { demoCast } from './demoFloor'
import { SeriesMemory } from './demoReadings'
import { loadDemoCustomers } from './demoShipping'
import { loadDemoStory } from './demoStory'
import { loadDemoRecipes } from './loadRecipes'
import { withTransaction } from '../db/sql'
import type { Transaction } from 'sequelize'

/** The actor the audit log names for demo rows. */
export const SEED_ACTOR: Actor = { id: null, email: 'seed@waymark', ip: null, requestId: null }

/** Audits the creation of a demo row, unless `found` found it already there. */
async function auditNew(
  entity: 'user' | 'station',
  after: object,
  found: Promise<[{ id: string }, boolean]>,
  transaction: Transaction,
): Promise<void> {
  const [row, isNew] = await found
  if (isNew)
    await recordAudit(
      SEED_ACTOR,
      { action: `${entity}.create`, entity, entityId: row.id, after },
      transaction,
    )
}

/** The demo people (one per role, two operators) and stations: what a test stack needs. */
export async function loadPeopleAndFloor(): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD, DEMO_HASH_COST)
  await withTransaction(async (transaction) => {
    for (const u of DEMO_USERS) {
      const defaults = { ...u, passwordHash, lastSignInAt: null }
      await auditNew(
        'user',
        u,
        User.findOrCreate({ where: { email: u.email }, defaults, transaction }),
        transaction,
      )
    }
    for (const s of DEMO_STATIONS)
      await auditNew(
        'station',
        s,
        Station.findOrCreate({ where: { code: s.code }, defaults: s, transaction }),
        transaction,
      )
  })
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
    // Alerts are judged after each step run of the story, at its time, as the alerts worker
    // would have: the Yield board is settled when the app first serves, and the jobs the scans
    // queued find nothing new to raise afterwards (an alert is stored once).
    const judged = new DemoAlerts()
    await loadDemoStory({
      clock: demoClock(anchor),
      cast,
      memory: new SeriesMemory(),
      alerts: judged,
    })
    await judged.sendDigestsDue(new Date(anchor.getTime() - 1))
    const alerts = judged.raised
    // The anchor the story's dates hang from, so a reader (or a test) can rebuild its calendar.
    await recordAudit(SEED_ACTOR, {
      action: 'demo.load',
      entity: 'demo',
      after: { anchor: anchor.toISOString(), alerts },
    })
  }
  return true
}
