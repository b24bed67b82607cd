import { PDFParse } from 'pdf-parse'
import type { Response } from 'superagent'
import { beforeAll, describe, expect, it } from 'vitest'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { resetSignInLimits, signedInAs, uniqueSuffix } from './support/client'
import type { TestClient } from './support/client'

function asBytes(res: Response, done: (err: Error | null, body: unknown) => void): void {
  const chunks: Buffer[] = []
  const stream = res as unknown as NodeJS.ReadableStream
  stream.on('data', (c: Buffer) => chunks.push(c))
  stream.on('end', () => done(null, Buffer.concat(chunks)))
}

// A label printed for a lot that may not be fitted says so (issue 20, point 2).
describe('component lot labels of held and expired lots', () => {
  let stores: TestClient
  let partId: string

  const labelText = async (lot: ComponentLotDto) => {
    const res = await stores
      .get(`/api/component-lots/${lot.id}/label.pdf`)
      .buffer(true)
      .parse(asBytes)
      .expect(200)
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
    await resetSignInLimits()
    stores = await signedInAs('stores')
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
