import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import type { ContainedUnitDto, EndContainmentResultDto } from '../../shared/schemas/trace'
import { DEMO_PASSWORD } from '../../server/seed/demoUsers'
import { ComponentLot, db, Unit } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'

async function auditCount(action: string, entityIds: string[]): Promise<number> {
  const [row] = await db().query<{ n: string }>(
    'SELECT count(*) AS n FROM audit_events WHERE action = :action AND entity_id IN (:entityIds)',
    { replacements: { action, entityIds }, type: QueryTypes.SELECT },
  )
  return Number(row!.n)
}

const unitsBySerial = async (serials: string[]) =>
  Object.fromEntries(
    (await Unit.findAll({ where: { serial: serials } })).map((u) => [u.serial, u] as const),
  )

describe('ending a containment and deciding its units', () => {
  const { engineer, lead, stores, operator } = signedInRoles(...LOT_ROLES)
  // Lot a: three units wound with component lot A; the first passed its load test.
  // Lot b: two units wound with component lot B. The last unit of lot a holds B as well.
  let a: TestLot
  let b: TestLot
  let sa: string[]
  let sb: string[]
  const reason = 'supplier reports cracked cores in this batch'
  const endPath = (t: TestLot) => `/api/trace/component-lots/${t.componentLotCode}/end-containment`
  const decide = (serial: string) => `/api/trace/units/${serial}/containment-decision`

  beforeAll(async () => {
    a = await releasedTestLot({ engineer, lead, stores }, 3)
    b = await releasedTestLot({ engineer, lead, stores }, 2)
    sa = a.units.map((u) => u.serial)
    sb = b.units.map((u) => u.serial)
    for (const s of sa) await operator.post('/api/step-runs', windingRun(a, s)).expect(201)
    for (const s of sb) await operator.post('/api/step-runs', windingRun(b, s)).expect(201)
    await operator.post('/api/step-runs', loadTestRun(sa[0]!, 350)).expect(201)
    // Test setup only: the last unit of lot a also holds a piece of B, fitted at its winding run.
    const [unit] = await db().query<{ id: string; run_id: string }>(
      `SELECT u.id, sr.id AS run_id FROM units u JOIN step_runs sr ON sr.unit_id = u.id
        WHERE u.serial = :serial`,
      { replacements: { serial: sa[2] }, type: QueryTypes.SELECT },
    )
    const lotB = (await ComponentLot.findOne({ where: { internalCode: b.componentLotCode } }))!
    await db().query(
      `INSERT INTO consumptions (id, unit_id, component_lot_id, part_id, bom_line_id, step_run_id, quantity, created_at)
       VALUES (:id, :unitId, :lotId, :partId, :lineId, :runId, 1, now())`,
      {
        replacements: {
          id: randomUUID(),
          unitId: unit!.id,
          lotId: lotB.id,
          partId: lotB.partId,
          lineId: b.rev.bom[0]!.id,
          runId: unit!.run_id,
        },
      },
    )
    for (const t of [a, b])
      await lead
        .post(`/api/trace/component-lots/${t.componentLotCode}/contain`, { reason })
        .expect(200)
  }, 120_000)

  it('keeps a contained lot in quarantine until its containment ends, and names bad input', async () => {
    const lotA = (await ComponentLot.findOne({ where: { internalCode: a.componentLotCode } }))!
    const moved = await stores.post(`/api/component-lots/${lotA.id}/status`, {
      status: 'available',
      reason: 'looks fine to me',
    })
    expect(moved.status).toBe(409)
    expect(moved.body.message).toBe(
      '3 unit(s) are held by the containment of this lot: end the containment on its recall page in Trace, which also moves the lot',
    )
    // No decision for a unit while a lot fitted in it is still contained.
    const early = await lead.post(decide(sa[0]!), { decision: 'scrap' })
    expect(early.status).toBe(409)
    expect(early.body.message).toBe(
      `${sa[0]} holds component lot ${a.componentLotCode}, which is still contained: end that containment first`,
    )
    expect((await lead.post(endPath(a), { reason })).body.fields).toHaveProperty('outcome')
    expect(
      (await lead.post(endPath(a), { outcome: 'cleared', reason: 'ok' })).body.fields,
    ).toHaveProperty('reason')
    expect((await operator.post(endPath(a), { outcome: 'cleared', reason })).status).toBe(403)
    const units = await unitsBySerial(sa)
    expect(sa.map((s) => units[s]!.state)).toEqual(['on_hold', 'on_hold', 'on_hold'])
  })

  it('clears a lot: its units go back to where they stood, unless another contained lot is in them', async () => {
    const found = 'the supplier’s cracked cores were from another batch'
    const res = await lead.post(endPath(a), { outcome: 'cleared', reason: found }).expect(200)
    const out = res.body as EndContainmentResultDto
    expect(out.released).toEqual([sa[0], sa[1]])
    expect(out.stillHeld).toEqual([
      {
        serial: sa[2],
        reason: `still contained: component lot ${b.componentLotCode} is quarantined`,
      },
    ])
    expect(out.scope.componentLot.status).toBe('available')
    expect(out.scope.units.map((u) => [u.serial, u.isContained])).toEqual([
      [sa[0], false],
      [sa[1], false],
      [sa[2], true],
    ])
    const units = await unitsBySerial(sa)
    expect(sa.map((s) => [units[s]!.state, units[s]!.holdKind])).toEqual([
      ['passed', null],
      ['in_progress', null],
      ['on_hold', 'containment'],
    ])
    // The Floor takes the released unit again and still refuses the held one.
    await operator.post('/api/step-runs', loadTestRun(sa[1]!, 350)).expect(201)
    expect((await operator.post('/api/step-runs', loadTestRun(sa[2]!, 350))).status).toBe(409)
    const lotId = out.scope.componentLot.id
    expect(await auditCount('component_lot.end_containment', [lotId])).toBe(1)
    expect(
      await auditCount('unit.release', [units[sa[0]!]!.id, units[sa[1]!]!.id, units[sa[2]!]!.id]),
    ).toBe(2)
    const again = await lead.post(endPath(a), { outcome: 'cleared', reason: found })
    expect(again.status).toBe(409)
    expect(again.body.message).toBe(
      `component lot ${a.componentLotCode} is available, not quarantined: there is no containment to end`,
    )
  })

  it('rejects a lot: its units stay held, each waiting for a decision', async () => {
    const found = 'cores measured 30 % under their rated inductance factor'
    const out = (await lead.post(endPath(b), { outcome: 'rejected', reason: found }).expect(200))
      .body as EndContainmentResultDto
    expect(out.released).toEqual([])
    expect(out.stillHeld.map((h) => h.serial).sort()).toEqual([sa[2], ...sb].sort())
    expect(out.stillHeld[0]!.reason).toBe(
      `component lot ${b.componentLotCode} rejected: ${found}; decide this unit`,
    )
    expect(out.scope.componentLot.status).toBe('rejected')
    const info = (await lead.get(`/api/trace/units/${sb[0]}/containment`).expect(200))
      .body as ContainedUnitDto
    expect(info).toMatchObject({
      serial: sb[0],
      state: 'on_hold',
      heldFromState: 'in_progress',
      stillContainedBy: [],
      rejectedLots: [{ code: b.componentLotCode, fittedAtStep: { name: 'Winding', position: 1 } }],
    })
    // Only the fitting step or one before it can replace the part: Winding is the first step.
    expect(info.reworkSteps.map((s) => s.name)).toEqual(['Winding'])
  })

  it('reworks, scraps or releases each unit of a rejected lot, audited', async () => {
    const info = (await lead.get(`/api/trace/units/${sb[0]}/containment`)).body as ContainedUnitDto
    const bad = await lead.post(decide(sb[0]!), { decision: 'rework' })
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('reworkToStepId')
    const reworked = await lead
      .post(decide(sb[0]!), {
        decision: 'rework',
        reworkToStepId: info.reworkSteps[0]!.id,
        reason: 'replace the core',
      })
      .expect(200)
    expect(reworked.body).toMatchObject({
      state: 'in_rework',
      currentStep: { name: 'Winding' },
      reworkCount: 1,
    })
    // Rewound with a good lot, it is back at its load test and no longer in rework.
    const fresh = await stores
      .post('/api/component-lots', {
        partId: b.rev.bom[0]!.partId,
        supplierName: 'Test',
        supplierLotCode: `S-${uniqueSuffix()}`,
        quantityReceived: 5,
        receivedOn: '2026-11-01',
      })
      .expect(201)
    const rewound = await operator
      .post(
        '/api/step-runs',
        windingRun(b, sb[0]!, {
          consumptions: [{ bomLineId: b.rev.bom[0]!.id, code: fresh.body.internalCode }],
        }),
      )
      .expect(201)
    expect(rewound.body.unit).toMatchObject({
      state: 'in_progress',
      currentStep: { name: 'Load test' },
    })

    await lead.post(decide(sb[1]!), { decision: 'scrap', reason: 'core cracked' }).expect(200)

    const keep = 'tested at 110 % load for an hour; the core in it measures in range'
    expect(
      (await lead.post(decide(sa[2]!), { decision: 'release', reason: 'ok' })).body.fields,
    ).toHaveProperty('reason')
    const unsigned = await lead.post(decide(sa[2]!), { decision: 'release', reason: keep })
    expect(unsigned.body.fields).toHaveProperty('countersign')
    expect((await operator.post(decide(sa[2]!), { decision: 'scrap' })).status).toBe(403)
    const released = await lead
      .post(decide(sa[2]!), {
        decision: 'release',
        reason: keep,
        countersign: { email: 'engineer@ferncastle.example', password: DEMO_PASSWORD },
      })
      .expect(200)
    expect(released.body).toMatchObject({
      state: 'in_progress',
      currentStep: { name: 'Load test' },
    })

    const units = await unitsBySerial([sb[0]!, sb[1]!, sa[2]!])
    expect(units[sb[1]!]!.state).toBe('scrapped')
    expect(
      await auditCount(
        'unit.containment_decision',
        Object.values(units).map((u) => u.id),
      ),
    ).toBe(3)
    const done = await lead.post(decide(sb[1]!), { decision: 'scrap' })
    expect(done.status).toBe(409)
    expect(done.body.message).toBe(`${sb[1]} is not held by a containment`)
  })
})
