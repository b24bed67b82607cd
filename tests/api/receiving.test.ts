import { createHash } from 'node:crypto'
import { PDFParse } from 'pdf-parse'
import { beforeAll, describe, expect, it } from 'vitest'
import { isValidMod3736 } from '../../shared/checkCharacter'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { AuditEvent } from '../../server/models'
import { signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { binary } from './support/pdf'

// The smallest valid files of each type, built here so the test needs no fixtures on disk.
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)
const PNG = Buffer.from(
  '89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c6360000002000154a24f5d0000000049454e44ae426082',
  'hex',
)

describe('receiving', () => {
  const { stores } = signedInRoles('stores')
  let partId: string
  let expiringPartId: string
  const receive = (over: Record<string, unknown> = {}) =>
    stores.post('/api/component-lots', {
      partId,
      supplierName: 'Test Supplier',
      supplierLotCode: `S-${uniqueSuffix()}`,
      quantityReceived: 100,
      receivedOn: '2026-11-20',
      ...over,
    })

  beforeAll(async () => {
    partId = (
      await stores.post('/api/parts', {
        partNumber: `RP-${uniqueSuffix()}`,
        description: 'Receiving test core',
      })
    ).body.id
    expiringPartId = (
      await stores.post('/api/parts', {
        partNumber: `RT-${uniqueSuffix()}`,
        description: 'Tape',
        hasExpiry: true,
      })
    ).body.id
  })

  it('receives a lot with a unique internal code carrying a valid MOD 37,36 check character', async () => {
    const a = (await receive().expect(201)).body as ComponentLotDto
    const b = (await receive().expect(201)).body as ComponentLotDto
    expect(a.internalCode).toMatch(/^CL-26-\d{5}[0-9A-Z]$/)
    expect(isValidMod3736(a.internalCode)).toBe(true)
    expect(b.internalCode).not.toBe(a.internalCode)
    expect(a).toMatchObject({
      quantityRemaining: 100,
      status: 'available',
      isExpired: false,
      certificate: null,
    })
  })

  it('refuses bad input naming the field', async () => {
    const res = await receive({ quantityReceived: 0, receivedOn: '20-11-2026' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.fields).sort()).toEqual(['quantityReceived', 'receivedOn'])
    const early = await receive({ partId: expiringPartId, expiresOn: '2026-01-01' })
    expect(early.body.fields).toEqual({ expiresOn: 'the expiry date is before the date received' })
  })

  it('shows a lot past its expiry date as expired', async () => {
    const lot = (
      await receive({
        partId: expiringPartId,
        receivedOn: '2020-01-01',
        expiresOn: '2021-01-01',
      }).expect(201)
    ).body
    expect(lot.isExpired).toBe(true)
  })

  it('moves status only along the allowed moves, with the reason audited', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const q = await stores.post(`/api/component-lots/${lot.id}/status`, {
      status: 'quarantined',
      reason: 'supplier recall notice',
    })
    expect(q.body.status).toBe('quarantined')
    const audit = await AuditEvent.findOne({
      where: { entityId: lot.id, action: 'component_lot.status' },
    })
    expect(audit?.after).toEqual({ status: 'quarantined', reason: 'supplier recall notice' })
    await stores
      .post(`/api/component-lots/${lot.id}/status`, { status: 'rejected', reason: 'confirmed bad' })
      .expect(200)
    const back = await stores.post(`/api/component-lots/${lot.id}/status`, {
      status: 'available',
      reason: 'changed mind',
    })
    expect(back.status).toBe(409)
    expect(back.body.error).toBe('status_move_refused')
    const noReason = await stores.post(`/api/component-lots/${lot.id}/status`, {
      status: 'quarantined',
      reason: '',
    })
    expect(noReason.body.fields).toHaveProperty('reason')
  })

  it('marks a lot used up when a stock count finds none left, and available when some are found', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    expect(
      (await stores.patch(`/api/component-lots/${lot.id}`, { quantityRemaining: 0 })).body.status,
    ).toBe('used_up')
    expect(
      (await stores.patch(`/api/component-lots/${lot.id}`, { quantityRemaining: 4 })).body.status,
    ).toBe('available')
    expect(
      (await stores.patch(`/api/component-lots/${lot.id}`, { quantityRemaining: 101 })).status,
    ).toBe(400)
  })

  it('stores a certificate by content type under its sha256 and serves the same bytes', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const res = await stores
      .send('put', `/api/component-lots/${lot.id}/certificate`)
      .attach('file', PDF, 'cert.pdf')
    expect(res.status).toBe(200)
    expect(res.body.certificate).toMatchObject({
      filename: 'cert.pdf',
      contentType: 'application/pdf',
      size: PDF.length,
    })
    expect(res.body.certificate.sha256).toBe(createHash('sha256').update(PDF).digest('hex'))
    const service = await signedInAs('service')
    const file = await binary(service.get(`/api/component-lots/${lot.id}/certificate`))
    expect(file.status).toBe(200)
    expect(Buffer.compare(file.body as Buffer, PDF)).toBe(0)
    const png = await stores
      .send('put', `/api/component-lots/${lot.id}/certificate`)
      .attach('file', PNG, 'scan.png')
    expect(png.body.certificate.contentType).toBe('image/png')
  })

  it('refuses a file by its content, not its name, and a file over 10 MB', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const fake = await stores
      .send('put', `/api/component-lots/${lot.id}/certificate`)
      .attach('file', Buffer.from('just text, not a PDF'), 'cert.pdf')
    expect(fake.status).toBe(415)
    const big = Buffer.concat([PDF, Buffer.alloc(10 * 1024 * 1024 + 1)])
    const huge = await stores
      .send('put', `/api/component-lots/${lot.id}/certificate`)
      .attach('file', big, 'big.pdf')
    expect(huge.status).toBe(413)
    const none = await stores.send('put', `/api/component-lots/${lot.id}/certificate`)
    expect(none.status).toBe(400)
    expect((await stores.get(`/api/component-lots/${lot.id}`)).body.certificate).toBeNull()
  })

  it('prints a label PDF whose text carries the internal code and part', async () => {
    const lot = (await receive().expect(201)).body as ComponentLotDto
    const res = await binary(stores.get(`/api/component-lots/${lot.id}/label.pdf`))
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toMatch(/application\/pdf/)
    const parser = new PDFParse({ data: res.body as Buffer })
    const text = (await parser.getText()).text
    await parser.destroy()
    expect(text).toContain(lot.internalCode)
    expect(text).toContain(lot.partNumber)
  })

  it('pages, filters and sorts component lots on the server', async () => {
    const page = await stores
      .get(`/api/component-lots?partId=${partId}&pageSize=2&sort=internalCode&order=asc`)
      .expect(200)
    expect(page.body.rows).toHaveLength(2)
    expect(page.body.total).toBeGreaterThan(2)
    const codes = page.body.rows.map((r: ComponentLotDto) => r.internalCode)
    expect([...codes].sort()).toEqual(codes)
    const quarantined = await stores.get('/api/component-lots?status=quarantined').expect(200)
    expect(quarantined.body.rows.every((r: ComponentLotDto) => r.status === 'quarantined')).toBe(
      true,
    )
    const search = await stores.get('/api/component-lots?q=HM-26-0502').expect(200)
    expect(search.body.rows.map((r: ComponentLotDto) => r.supplierLotCode)).toEqual(['HM-26-0502'])
  })
})

describe('parts and defect codes', () => {
  it('searches parts and refuses a duplicate part number', async () => {
    const engineer = await signedInAs('engineer')
    const res = await engineer.get('/api/parts?q=ferrite&sort=partNumber').expect(200)
    expect(res.body.rows.length).toBeGreaterThanOrEqual(2)
    expect(
      res.body.rows.every((p: { description: string }) => /ferrite/i.test(p.description)),
    ).toBe(true)
    const dup = await engineer.post('/api/parts', { partNumber: 'FCS-3000U', description: 'Again' })
    expect(dup.status).toBe(409)
    expect(dup.body.fields).toEqual({ partNumber: 'already in use' })
  })

  it('starts the shop with defect codes for every station kind and validates new ones', async () => {
    const engineer = await signedInAs('engineer')
    const list = (await engineer.get('/api/defect-codes').expect(200)).body as {
      stationKinds: string[]
    }[]
    for (const kind of ['winding', 'soldering', 'hipot', 'load_test', 'inspection'])
      expect(list.some((d) => d.stationKinds.includes(kind))).toBe(true)
    const bad = await engineer.post('/api/defect-codes', {
      code: 'X',
      description: '',
      stationKinds: ['welding'],
    })
    expect(Object.keys(bad.body.fields).sort()).toEqual(['code', 'description', 'stationKinds.0'])
    const code = `T-${uniqueSuffix()}`
    await engineer
      .post('/api/defect-codes', { code, description: 'Test defect', stationKinds: ['other'] })
      .expect(201)
  })
})
