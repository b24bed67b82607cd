import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import type { ContainResultDto, RecallScopeDto } from '../../shared/schemas/trace'
import { db, Email, Unit } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import { shipTo } from './support/shipments'

async function auditCount(action: string, entityIds: string[]): Promise<number> {
  const [row] = await db().query<{ n: string }>(
    'SELECT count(*) AS n FROM audit_events WHERE action = :action AND entity_id IN (:entityIds)',
    { replacements: { action, entityIds }, type: QueryTypes.SELECT },
  )
  return Number(row!.n)
}

describe('recall scope and containment of a component lot', () => {
  const { engineer, lead, stores, operator, service, admin } = signedInRoles(
    ...LOT_ROLES,
    'service',
    'admin',
  )
  let t: TestLot
  let serials: string[]
  let northId: string

  beforeAll(async () => {
    t = await releasedTestLot({ engineer, lead, stores }, 5)
    serials = t.units.map((u) => u.serial)
    // All five get the component lot at winding; four finish, the fifth stays on the floor.
    for (const s of serials) await operator.post('/api/step-runs', windingRun(t, s)).expect(201)
    for (const s of serials.slice(0, 4))
      await operator.post('/api/step-runs', loadTestRun(s, 350)).expect(201)
    const north = await shipTo(
      serials.slice(0, 2),
      `Northmoor ${uniqueSuffix()}`,
      'buyer@northmoor.example',
    )
    northId = north.customer.id
    await shipTo([serials[2]!], `Ostend Marine ${uniqueSuffix()}`, 'ops@ostend.example')
    // A shipped unit that came back counts as shipped but is not in the customer's letter.
    await Unit.update({ state: 'returned' }, { where: { serial: serials[0]! } })
  }, 120_000)

  it('groups every unit holding the lot by where it stands and by customer', async () => {
    const res = await service.get(`/api/trace/component-lots/${t.componentLotCode}`).expect(200)
    const scope = res.body as RecallScopeDto
    expect(scope.counts).toEqual({ in_progress: 1, finished: 1, shipped: 3, total: 5, scrapped: 0 })
    expect(scope.units.map((u) => [u.serial, u.group])).toEqual([
      [serials[0], 'shipped'],
      [serials[1], 'shipped'],
      [serials[2], 'shipped'],
      [serials[3], 'finished'],
      [serials[4], 'in_progress'],
    ])
    expect(scope.customers[0]).toMatchObject({
      customerId: northId,
      counts: { shipped: 2, finished: 0, in_progress: 0 },
      total: 2,
    })
    expect(scope.customers[1]!.customerName).toMatch(/^Ostend Marine/)
    expect(scope.customers[2]).toMatchObject({ customerId: null, total: 2 })
    // The label URL finds the same lot.
    const url = encodeURIComponent(`https://waymark.example/c/${t.componentLotCode}`)
    expect(
      (await service.get(`/api/trace/component-lots/${url}`).expect(200)).body.counts.total,
    ).toBe(5)
  })

  it('exports the scope as CSV', async () => {
    const res = await service
      .get(`/api/trace/component-lots/${t.componentLotCode}?format=csv`)
      .expect(200)
    expect(res.headers['content-type']).toMatch(/text\/csv/)
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="recall-scope-/)
    const lines = res.text.trim().split('\n')
    expect(lines[0]).toBe(
      'serial,where,state,lot,customer,shipment,shipped_on,component_lot,supplier_lot,quantity_fitted',
    )
    expect(lines).toHaveLength(6)
    expect(lines[4]).toContain(`${serials[3]},"Finished, not shipped",passed`)
  })

  it('lets only a lead contain, and asks for a reason', async () => {
    const path = `/api/trace/component-lots/${t.componentLotCode}/contain`
    expect((await service.post(path, { reason: 'suspect cores' })).status).toBe(403)
    expect((await engineer.post(path, { reason: 'suspect cores' })).status).toBe(403)
    const short = await lead.post(path, { reason: 'bad' })
    expect(short.status).toBe(400)
    expect(short.body.fields).toHaveProperty('reason')
    expect(
      (
        await lead.post('/api/trace/component-lots/CL-00-NOPE/contain', {
          reason: 'suspect cores cracked',
        })
      ).status,
    ).toBe(404)
  })

  it('holds the units still here, quarantines the lot and drafts one letter per customer', async () => {
    // The returned unit is back in the shop for service: it is held too, so it cannot be repaired
    // and sent out again with the suspect part.
    const reason = 'supplier reports cracked cores in this batch'
    const res = await lead
      .post(`/api/trace/component-lots/${t.componentLotCode}/contain`, { reason })
      .expect(200)
    const out = res.body as ContainResultDto
    expect(out.held).toEqual([serials[0], serials[3], serials[4]])
    expect(out.quarantined).toBe(true)
    expect(out.scope.componentLot.status).toBe('quarantined')
    // Held units still count where they stood.
    expect(out.scope.counts).toMatchObject({ in_progress: 1, finished: 1, shipped: 3 })
    const held = await Unit.findAll({
      where: { serial: [serials[0]!, serials[3]!, serials[4]!] },
      order: [['serial', 'ASC']],
    })
    expect(held.map((u) => [u.state, u.heldFromState, u.holdKind])).toEqual([
      ['on_hold', 'returned', 'containment'],
      ['on_hold', 'passed', 'containment'],
      ['on_hold', 'in_progress', 'containment'],
    ])
    expect(held[0]!.holdReason).toContain(reason)
    // The Floor refuses the held unit and says why.
    const refused = await operator.post('/api/step-runs', loadTestRun(serials[4]!, 350))
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/contained/)

    expect(out.drafts.map((d) => [d.to, d.serials])).toEqual([
      ['buyer@northmoor.example', [serials[1]]],
      ['ops@ostend.example', [serials[2]]],
    ])
    const drafts = await Email.findAll({ where: { id: out.drafts.map((d) => d.emailId) } })
    expect(drafts.map((d) => d.status)).toEqual(['draft', 'draft'])
    const north = drafts.find((d) => d.toAddresses[0] === 'buyer@northmoor.example')!
    expect(north.textBody).toContain(serials[1])
    expect(north.textBody).not.toContain(serials[0])

    expect(
      await auditCount(
        'unit.hold',
        held.map((u) => u.id),
      ),
    ).toBe(3)
    const lotId = out.scope.componentLot.id
    expect(await auditCount('component_lot.status', [lotId])).toBe(1)
    expect(await auditCount('component_lot.contain', [lotId])).toBe(1)
    expect(
      await auditCount(
        'email.draft',
        out.drafts.map((d) => d.emailId),
      ),
    ).toBe(2)

    // Containing again changes nothing and writes no second letter.
    const again = (
      await lead
        .post(`/api/trace/component-lots/${t.componentLotCode}/contain`, { reason })
        .expect(200)
    ).body as ContainResultDto
    expect(again).toMatchObject({
      held: [],
      alreadyHeld: [serials[0], serials[3], serials[4]],
      quarantined: false,
      drafts: [],
    })
  })

  it('lets service edit a draft and send it; a sent one cannot be edited', async () => {
    const draft = await Email.findOne({
      where: { status: 'draft', toAddresses: ['ops@ostend.example'] },
      order: [['createdAt', 'DESC']],
    })
    const path = `/api/outbox/${draft!.id}`
    expect((await lead.patch(path, { subject: 'x' })).status).toBe(403)
    expect((await service.patch(path, {})).status).toBe(400)
    const edited = await service
      .patch(path, { subject: 'Please hold one unit', text: `${draft!.textBody}\nThank you.` })
      .expect(200)
    expect(edited.body).toMatchObject({ status: 'draft', subject: 'Please hold one unit' })
    expect((await lead.post(`${path}/send`)).status).toBe(403)
    const sent = await service.post(`${path}/send`).expect(200)
    expect(sent.body.status).toBe('queued')
    expect((await admin.post(`${path}/send`)).status).toBe(409)
    expect((await service.patch(path, { subject: 'late' })).status).toBe(409)
    expect(await auditCount('email.edit_draft', [draft!.id])).toBe(1)
    expect(await auditCount('email.send_draft', [draft!.id])).toBe(1)
  })

  it('refuses the recall scope to roles without the trace permission', async () => {
    expect((await operator.get(`/api/trace/component-lots/${t.componentLotCode}`)).status).toBe(403)
    expect((await stores.get(`/api/trace/component-lots/${t.componentLotCode}`)).status).toBe(403)
  })
})
