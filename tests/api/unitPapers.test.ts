import { beforeAll, describe, expect, it } from 'vitest'
import type { DocumentDto } from '../../shared/schemas/lots'
import type {
  CustomerDto,
  ReturnableUnitDto,
  ServiceCaseDto,
  ShipmentDto,
  ShippableUnitDto,
} from '../../shared/schemas/shipping'
import type { UnitTraceDto } from '../../shared/schemas/trace'
import { AuditEvent, Document, Lot } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'

// A unit's documents in one list, certificates refused while a return is open unless
// confirmed, and what packing and the return dialog are told about a serial before saving.
describe('a unit’s papers, open returns and the checks before shipping and returns', () => {
  const { engineer, lead, stores, operator, service } = signedInRoles(...LOT_ROLES, 'service')
  let t: TestLot
  let customer: CustomerDto
  let shipment: ShipmentDto
  /** Shipped, then returned (its case stays open). */
  let returned: string
  /** Shipped in the same shipment, never returned. */
  let clean: string
  /** Only wound. */
  let unfinished: string
  let caseNumber: string

  beforeAll(async () => {
    t = await releasedTestLot({ engineer, lead, stores }, 3)
    ;[returned, clean, unfinished] = t.units.map((u) => u.serial) as [string, string, string]
    for (const s of [returned, clean]) {
      await operator.post('/api/step-runs', windingRun(t, s)).expect(201)
      await operator.post('/api/step-runs', loadTestRun(s, 350.4)).expect(201)
    }
    await operator.post('/api/step-runs', windingRun(t, unfinished)).expect(201)
    customer = (
      await lead
        .post('/api/customers', {
          name: `Kestrel Marine ${uniqueSuffix()}`,
          contactEmail: `buyer.${uniqueSuffix()}@kestrel.example`,
        })
        .expect(201)
    ).body as CustomerDto
    // Test setup only: the lot was built for this customer.
    await Lot.update({ customerId: customer.id }, { where: { id: t.lot.id } })
  })

  it('tells packing the customer the unit’s lot was built for', async () => {
    const res = await lead.get(`/api/shipments/units/${clean}`).expect(200)
    const unit = res.body as ShippableUnitDto
    expect(unit).toMatchObject({
      serial: clean,
      lotCustomerId: customer.id,
      lotCustomerName: customer.name,
      refusal: null,
    })
    shipment = (
      await lead
        .post('/api/shipments', {
          customerId: customer.id,
          shippedOn: '2026-12-02',
          serials: [returned, clean],
        })
        .expect(201)
    ).body as ShipmentDto
  })

  it('shows the return dialog the unit, product and customer before a return is logged', async () => {
    const res = await service.get(`/api/service-cases/units/${returned.toLowerCase()}`).expect(200)
    const unit = res.body as ReturnableUnitDto
    expect(unit).toMatchObject({
      serial: returned,
      state: 'shipped',
      productCode: t.lot.productCode,
      revisionLetter: t.lot.revisionLetter,
      lotNumber: t.lot.number,
      customerName: customer.name,
      shipmentNumber: shipment.number,
      shippedOn: '2026-12-02',
      refusal: null,
    })
    const notShipped = (await service.get(`/api/service-cases/units/${unfinished}`).expect(200))
      .body as ReturnableUnitDto
    expect(notShipped.refusal).toMatch(/a return is logged for a unit that shipped/)
    await service.get('/api/service-cases/units/NOPE-0000-00000X').expect(404)
    await engineer.get(`/api/service-cases/units/${returned}`).expect(403)

    const opened = (
      await service
        .post('/api/service-cases', {
          serial: returned,
          complaint: 'output drops out under load',
          receivedOn: '2026-12-03',
        })
        .expect(201)
    ).body as ServiceCaseDto
    caseNumber = opened.number
    const again = (await service.get(`/api/service-cases/units/${returned}`).expect(200))
      .body as ReturnableUnitDto
    expect(again.refusal).toBe(`return ${caseNumber} is already open for it`)
  })

  it('refuses a unit certificate while a return is open, naming it, until confirmed', async () => {
    const before = await Document.count({ where: { kind: 'certificate' } })
    const refused = await service.post(`/api/units/${returned}/certificate`, {})
    expect(refused.status).toBe(409)
    expect(refused.body.error).toBe('open_return')
    expect(refused.body.message).toContain(`${returned} has open return ${caseNumber}`)
    expect(refused.body.fields).toHaveProperty('confirmOpenReturn')
    expect(refused.body.details).toEqual({
      openReturns: [{ serial: returned, number: caseNumber }],
    })
    expect(await Document.count({ where: { kind: 'certificate' } })).toBe(before)

    const bad = await service.post(`/api/units/${returned}/certificate`, {
      confirmOpenReturn: 'yes',
    })
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('confirmOpenReturn')

    const made = await service
      .post(`/api/units/${returned}/certificate`, { confirmOpenReturn: true })
      .expect(201)
    const audited = await AuditEvent.count({ where: { entityId: (made.body as DocumentDto).id } })
    expect(audited).toBeGreaterThan(0)
    // A unit with no return needs no confirmation.
    await service.post(`/api/units/${clean}/certificate`, {}).expect(201)
  })

  it('refuses a shipment certificate while one of its units has a return open', async () => {
    const refused = await service.post(`/api/shipments/${shipment.id}/certificate`, {})
    expect(refused.status).toBe(409)
    expect(refused.body.details.openReturns).toEqual([{ serial: returned, number: caseNumber }])
    await service
      .post(`/api/shipments/${shipment.id}/certificate`, { confirmOpenReturn: true })
      .expect(201)
  })

  it('lists one serial’s documents exactly as its trace does, shipment papers included', async () => {
    const listed = (await service.get(`/api/units/${returned}/documents`).expect(200))
      .body as DocumentDto[]
    const trace = (await service.get(`/api/trace/units/${returned}`).expect(200))
      .body as UnitTraceDto
    expect(new Set(listed.map((d) => d.id))).toEqual(new Set(trace.documents.map((d) => d.id)))
    const kinds = listed.map((d) => d.kind)
    // Its own certificate, the shipment's certificate and packing slip, the lot's papers.
    expect(kinds.filter((k) => k === 'certificate')).toHaveLength(2)
    expect(kinds).toContain('packing_slip')
    const times = listed.map((d) => d.createdAt)
    expect([...times].sort().reverse()).toEqual(times)
    // The other unit of the shipment does not see this unit's own certificate.
    const other = (await service.get(`/api/units/${clean}/documents`).expect(200))
      .body as DocumentDto[]
    expect(other.filter((d) => d.kind === 'certificate')).toHaveLength(2)
  })
})
