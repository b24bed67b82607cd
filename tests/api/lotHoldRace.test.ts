import { setTimeout as sleep } from 'node:timers/promises'
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { db } from '../../server/models'
import { LOT_ROLES, signedInRoles } from './support/client'
import { releasedTestLot, windingRun } from './support/floor'

// A hold and the first scans of a freshly released lot take the lot's and the units' row locks;
// taken in two orders they deadlocked, and PostgreSQL's victim answered 500.
describe('a hold racing the first scans of a released lot', () => {
  const clients = signedInRoles(...LOT_ROLES)

  it('ends in one answer each time: scans recorded before the hold, or refused by it', async () => {
    const { lead, operator } = clients
    for (let round = 0; round < 20; round++) {
      const t = await releasedTestLot(clients, 10)
      const scanning = t.units.map((u) => operator.post('/api/step-runs', windingRun(t, u.serial)))
      // The scans go first; the hold follows after a pause that grows with each round, so that
      // over the rounds it lands before, among and after the scans' writes.
      const holding = sleep(round * 10).then(() =>
        lead.post(`/api/lots/${t.lot.id}/hold`, { reason: `race ${round}` }),
      )
      const [hold, ...scans] = await Promise.all([holding, ...scanning])
      expect(hold!.status, JSON.stringify(hold!.body)).toBe(200)
      const recorded = new Set<string>()
      scans.forEach((s, i) => {
        if (s.status === 201) recorded.add(t.units[i]!.serial)
        else expect([s.status, s.body.error], JSON.stringify(s.body)).toEqual([409, 'lot_on_hold'])
      })
      // What the database holds agrees with the answers: every unit is held, and only the
      // recorded scans left a run.
      const units = await db().query<{
        serial: string
        state: string
        runs: number
      }>(
        `SELECT u.serial, u.state,
                (SELECT count(*)::int FROM step_runs r WHERE r.unit_id = u.id) AS runs
           FROM units u WHERE u.lot_id = :lotId`,
        { replacements: { lotId: t.lot.id }, type: QueryTypes.SELECT },
      )
      for (const u of units) {
        expect(u.state).toBe('on_hold')
        expect(u.runs).toBe(recorded.has(u.serial) ? 1 : 0)
      }
      // The hold's audit row names every unit it held, as a containment's does.
      const [audit] = await db().query<{ after: { units: string[] } }>(
        `SELECT after FROM audit_events WHERE action = 'lot.hold' AND entity_id = :lotId`,
        { replacements: { lotId: t.lot.id }, type: QueryTypes.SELECT },
      )
      expect([...audit!.after.units].sort()).toEqual(units.map((u) => u.serial).sort())
      const lot = (await lead.get(`/api/lots/${t.lot.id}`).expect(200)).body
      expect(lot.status).toBe(recorded.size > 0 ? 'in_progress' : 'released')
    }
  }, 180_000)
})
