import { beforeAll, describe, expect, it } from 'vitest'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { AuditEvent } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'
import { releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'

// The smallest valid PDF, built here so the test needs no fixture on disk.
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)

describe('incoming inspection and expiry on receipt', () => {
  const { stores, engineer, operator, lead } = signedInRoles(...LOT_ROLES)
  let t: TestLot
  let partId: string

  const receive = (over: Record<string, unknown> = {}) =>
    stores.post('/api/component-lots', {
      partId,
      supplierName: 'Inspection Test Supplier',
      supplierLotCode: `IN-${uniqueSuffix()}`,
      quantityReceived: 20,
      receivedOn: '2026-11-20',
      expiresOn: '2027-05-19',
      ...over,
    })
  const fit = (code: string, unit = 0) =>
    operator.post(
      '/api/step-runs',
      windingRun(t, t.units[unit]!.serial, {
        consumptions: [{ bomLineId: t.rev.bom[0]!.id, code }],
      }),
    )
  const attachCertificate = (lot: ComponentLotDto) =>
    stores
      .send('put', `/api/component-lots/${lot.id}/certificate`)
      .attach('file', PDF, 'coc.pdf')
      .expect(200)

  beforeAll(async () => {
    t = await releasedTestLot({ engineer, lead, stores }, 3)
    partId = t.rev.bom[0]!.partId
    // The part fitted at winding now ages (180 days' shelf life) and needs incoming inspection.
    const part = await engineer
      .patch(`/api/parts/${partId}`, { hasExpiry: true, shelfLifeDays: 180, needsInspection: true })
      .expect(200)
    expect(part.body).toMatchObject({ hasExpiry: true, shelfLifeDays: 180, needsInspection: true })
  })

  it('keeps a shelf life only on a part whose lots expire', async () => {
    const res = await engineer.post('/api/parts', {
      partNumber: `SL-${uniqueSuffix()}`,
      description: 'Ferrite core',
      shelfLifeDays: 30,
    })
    expect(res.status).toBe(400)
    expect(res.body.fields).toEqual({ shelfLifeDays: 'only for a part whose lots expire' })
    const bad = await engineer.patch(`/api/parts/${partId}`, { shelfLifeDays: 0 })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.fields)).toEqual(['shelfLifeDays'])
  })

  it('requires the expiry date of a part that ages, suggesting it from the shelf life', async () => {
    const res = await receive({ expiresOn: null })
    expect(res.status).toBe(400)
    // 2026-11-20 + 180 days = 2027-05-19 (calendar count, from memory: 10 + 31 + 31 + 28 + 31 + 30 + 19).
    expect(res.body.fields).toEqual({
      expiresOn: 'enter the expiry date from the label (its shelf life suggests 2027-05-19)',
    })
  })

  it('starts a lot of a part that needs inspection quarantined; the Floor refuses it', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    expect(lot).toMatchObject({ status: 'quarantined', awaitsInspection: true, inspectedAt: null })
    const refused = await fit(lot.internalCode)
    expect(refused.status).toBe(409)
    expect(refused.body.message).toBe(
      `${lot.internalCode} is awaiting incoming inspection; take a lot that stores have accepted`,
    )
    // The Floor's look-up of the lot says the same before the operator submits.
    const looked = await operator
      .get(`/api/floor/component-lots/${lot.internalCode}?bomLineId=${t.rev.bom[0]!.id}`)
      .expect(200)
    expect(looked.body.refusal).toBe(refused.body.message)
    // Only inspection lets it out of quarantine; a plain status move is refused.
    const moved = await stores.post(`/api/component-lots/${lot.id}/status`, {
      status: 'available',
      reason: 'looks fine',
    })
    expect(moved.status).toBe(409)
    expect(moved.body.error).toBe('awaiting_inspection')
  })

  it('accepts a lot only with its certificate and a note, audited; then it can be fitted', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const noCert = await stores.post(`/api/component-lots/${lot.id}/inspection`, {
      decision: 'accept',
      note: 'AL checked on 3 pieces',
    })
    expect(noCert.status).toBe(400)
    expect(noCert.body.fields).toEqual({ certificate: "attach the supplier's certificate first" })
    await attachCertificate(lot)
    const noNote = await stores.post(`/api/component-lots/${lot.id}/inspection`, {
      decision: 'accept',
      note: '',
    })
    expect(noNote.status).toBe(400)
    expect(Object.keys(noNote.body.fields)).toEqual(['note'])
    const ok = await stores
      .post(`/api/component-lots/${lot.id}/inspection`, {
        decision: 'accept',
        note: 'AL checked on 3 pieces',
      })
      .expect(200)
    expect(ok.body).toMatchObject({
      status: 'available',
      awaitsInspection: false,
      inspectionNote: 'AL checked on 3 pieces',
    })
    expect(ok.body.inspectedAt).toEqual(expect.any(String))
    const audit = await AuditEvent.findOne({
      where: { entityId: lot.id, action: 'component_lot.inspection' },
    })
    expect(audit?.after).toMatchObject({
      decision: 'accept',
      status: 'available',
      note: 'AL checked on 3 pieces',
    })
    const again = await stores.post(`/api/component-lots/${lot.id}/inspection`, {
      decision: 'reject',
      note: 'second thoughts',
    })
    expect(again.status).toBe(409)
    expect((await fit(lot.internalCode, 1)).status).toBe(201)
  })

  it('rejects a lot at inspection without a certificate; it stays unusable', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const res = await stores
      .post(`/api/component-lots/${lot.id}/inspection`, {
        decision: 'reject',
        note: 'cores chipped in transit',
      })
      .expect(200)
    expect(res.body).toMatchObject({ status: 'rejected', awaitsInspection: false })
    expect((await fit(lot.internalCode)).body.message).toBe(
      `${lot.internalCode} was rejected; return it to stores`,
    )
    const operatorTry = await operator.post(`/api/component-lots/${lot.id}/inspection`, {
      decision: 'accept',
      note: 'not my job',
    })
    expect(operatorTry.status).toBe(403)
  })

  it('refuses an accepted lot once it has expired', async () => {
    const lot = (await receive({ receivedOn: '2026-01-05', expiresOn: '2026-02-01' }).expect(201))
      .body as ComponentLotDto
    await attachCertificate(lot)
    await stores
      .post(`/api/component-lots/${lot.id}/inspection`, { decision: 'accept', note: 'label read' })
      .expect(200)
    expect((await stores.get(`/api/component-lots/${lot.id}`).expect(200)).body.isExpired).toBe(
      true,
    )
    const res = await fit(lot.internalCode, 2)
    expect(res.status).toBe(409)
    expect(res.body.message).toBe(`${lot.internalCode} expired on 2026-02-01; return it to stores`)
  })

  it('receives a part that needs no inspection straight into stock', async () => {
    await engineer.patch(`/api/parts/${partId}`, { needsInspection: false }).expect(200)
    try {
      const lot = (await receive().expect(201)).body as ComponentLotDto
      expect(lot).toMatchObject({ status: 'available', awaitsInspection: false })
    } finally {
      await engineer.patch(`/api/parts/${partId}`, { needsInspection: true }).expect(200)
    }
  })
})
