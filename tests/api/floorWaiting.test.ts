import { beforeAll, describe, expect, it } from 'vitest'
import { LOT_ROLES, signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { releasedTestLot, windingRun } from './support/floor'

describe('the Floor’s waiting list and a traveler’s link', () => {
  const { engineer, lead, stores, operator, admin } = signedInRoles(...LOT_ROLES, 'admin')
  let winding = ''
  let loadTest = ''

  beforeAll(async () => {
    // Stations of our own, so the demo's stations and their queues do not matter here.
    winding = `WQ-${uniqueSuffix()}`.toUpperCase()
    loadTest = `LQ-${uniqueSuffix()}`.toUpperCase()
    await admin
      .post('/api/stations', { code: winding, name: 'Queue winder', kind: 'winding' })
      .expect(201)
    await admin
      .post('/api/stations', { code: loadTest, name: 'Queue load', kind: 'load_test' })
      .expect(201)
  })

  it('lists the units waiting for a station’s kind of step, oldest first, and drops them once worked', async () => {
    const t = await releasedTestLot({ engineer, lead, stores }, 3)
    const waitingOf = async (station: string) =>
      (await operator.get(`/api/floor/stations/${station}/waiting?lotId=${t.lot.id}`).expect(200))
        .body as { total: number; units: { serial: string; since: string; lotNumber: string }[] }
    const before = await waitingOf(winding)
    expect(before.total).toBe(3)
    expect(before.units.map((u) => u.serial).sort()).toEqual(t.units.map((u) => u.serial).sort())
    expect(before.units[0]!.lotNumber).toBe(t.lot.number)

    const worked = t.units[1]!.serial
    await operator
      .post('/api/step-runs', { ...windingRun(t, worked), stationCode: winding })
      .expect(201)
    const after = await waitingOf(winding)
    expect(after.units.map((u) => u.serial)).not.toContain(worked)
    // The unit just worked waits at load test now, and came last to winding's list: its time
    // is its run, later than its lot's release that the others wait since.
    const atLoad = await waitingOf(loadTest)
    expect(atLoad.units.map((u) => u.serial)).toEqual([worked])
    expect(atLoad.units[0]!.since > before.units[0]!.since).toBe(true)
  })

  it('lists every station’s queue oldest first', async () => {
    const all = (await operator.get(`/api/floor/stations/${winding}/waiting`).expect(200)).body
    const since = all.units.map((u: { since: string }) => u.since)
    expect(since.length).toBeGreaterThan(0)
    expect([...since].sort()).toEqual(since)
    const bad = await operator.get(`/api/floor/stations/${winding}/waiting?lotId=lot-7`)
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('lotId')
  })

  it('says where a unit waits: the step and the stations that work it', async () => {
    const t = await releasedTestLot({ engineer, lead, stores }, 1)
    const serial = t.units[0]!.serial
    const where = (await operator.get(`/api/floor/units/${serial}/where`).expect(200)).body
    expect(where).toMatchObject({
      serial,
      stepName: 'Winding',
      stationKind: 'winding',
      holdReason: null,
    })
    expect(where.stations.map((s: { code: string }) => s.code)).toContain(winding)
    // A serial nobody issued: refused as unknown or as mistyped, never a 5xx.
    const unknown = await operator.get('/api/floor/units/ZZ99-0000-00000A/where')
    expect([400, 404]).toContain(unknown.status)
  })

  it('keeps a held lot’s units off the list and says why they wait', async () => {
    const t = await releasedTestLot({ engineer, lead, stores }, 1)
    const serial = t.units[0]!.serial
    await lead.post(`/api/lots/${t.lot.id}/hold`, { reason: 'suspect tape batch' }).expect(200)
    const waiting = (await operator.get(`/api/floor/stations/${winding}/waiting`)).body
    expect(waiting.units.map((u: { serial: string }) => u.serial)).not.toContain(serial)
    const where = (await operator.get(`/api/floor/units/${serial}/where`)).body
    expect(where).toMatchObject({ state: 'on_hold', stepName: null, stations: [] })
    expect(where.holdReason).toContain('suspect tape batch')
  })

  it('is for the Floor’s roles only', async () => {
    const service = await signedInAs('service')
    await service.get(`/api/floor/stations/${winding}/waiting`).expect(403)
  })
})
