import { PDFParse } from 'pdf-parse'
import { beforeAll, describe, expect, it } from 'vitest'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { signedInRoles, uniqueSuffix } from './support/client'
import { binary } from './support/pdf'

// A label printed for a lot that may not be fitted says so (issue 20, point 2).
describe('component lot labels of held and expired lots', () => {
  const { stores } = signedInRoles('stores')
  let partId: string

  const labelText = async (lot: ComponentLotDto) => {
    const res = await binary(stores.get(`/api/component-lots/${lot.id}/label.pdf`)).expect(200)
    const parser = new PDFParse({ data: res.body as Buffer })
    try {
      return (await parser.getText()).text.normalize('NFKC')
    } finally {
      await parser.destroy()
    }
  }
  const receive = async (over: Record<string, unknown> = {}) =>
    (
      await stores
        .post('/api/component-lots', {
          partId,
          supplierName: 'Label Test Supplier',
          supplierLotCode: `S-${uniqueSuffix()}`,
          quantityReceived: 10,
          receivedOn: '2026-11-20',
          ...over,
        })
        .expect(201)
    ).body as ComponentLotDto

  beforeAll(async () => {
    partId = (
      await stores
        .post('/api/parts', {
          partNumber: `LB-${uniqueSuffix()}`,
          description: 'Label test tape',
          hasExpiry: true,
        })
        .expect(201)
    ).body.id
  })

  it('prints a good lot without a warning and a quarantined one with it', async () => {
    const lot = await receive({ expiresOn: '2099-12-31' })
    expect(await labelText(lot)).not.toContain('DO NOT FIT')
    await stores
      .post(`/api/component-lots/${lot.id}/status`, {
        status: 'quarantined',
        reason: 'supplier recall notice',
      })
      .expect(200)
    const text = await labelText(lot)
    expect(text).toContain('QUARANTINED · DO NOT FIT')
    expect(text).toContain(lot.internalCode)
  })

  it('prints an expired lot with its expiry date in the warning', async () => {
    const lot = await receive({ receivedOn: '2020-01-02', expiresOn: '2020-06-30' })
    expect(lot.isExpired).toBe(true)
    expect(await labelText(lot)).toContain('EXPIRED 2020-06-30 · DO NOT FIT')
  })
})
