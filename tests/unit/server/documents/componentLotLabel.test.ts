import jsQR from 'jsqr'
import { PDFParse } from 'pdf-parse'
import { PNG } from 'pngjs'
import { describe, expect, it } from 'vitest'
import {
  componentLotLabelPdf,
  labelWarningOf,
} from '../../../../server/documents/componentLotLabel'
import { componentLotUrl } from '../../../../shared/links'
import type { ComponentLotDto } from '../../../../shared/schemas/componentLots'

const BASE_URL = 'https://waymark.example.com'
const LOT: ComponentLotDto = {
  id: '00000000-0000-4000-8000-000000000001',
  internalCode: 'CL-26-00042K',
  partId: '00000000-0000-4000-8000-000000000002',
  partNumber: 'FCS-3000U',
  partDescription: 'Ferrite core set, AL 3000 nH',
  unitOfMeasure: 'pcs',
  supplierId: '00000000-0000-4000-8000-000000000003',
  supplierName: 'Example Ferrites',
  supplierLotCode: 'EF-2611-07',
  quantityReceived: 200,
  quantityRemaining: 150,
  receivedOn: '2026-11-02',
  expiresOn: '2027-11-02',
  isExpired: false,
  status: 'available',
  notes: '',
  awaitsInspection: false,
  inspectedAt: null,
  inspectionNote: '',
  certificate: null,
}

async function textAndQr(pdf: Buffer): Promise<{ text: string; qr: string | null }> {
  const parser = new PDFParse({ data: pdf })
  try {
    const text = (await parser.getText()).text
    const shot = await parser.getScreenshot({ partial: [1], scale: 3, imageDataUrl: false })
    const png = PNG.sync.read(Buffer.from(shot.pages[0]!.data))
    const qr = jsQR(new Uint8ClampedArray(png.data), png.width, png.height)
    return { text, qr: qr?.data ?? null }
  } finally {
    await parser.destroy()
  }
}

describe('labelWarningOf', () => {
  it('is null for a lot that may be fitted', () => {
    expect(labelWarningOf(LOT)).toBeNull()
    expect(labelWarningOf({ ...LOT, status: 'used_up' })).toBeNull()
  })
  it('names quarantine, rejection and expiry', () => {
    expect(labelWarningOf({ ...LOT, status: 'quarantined' })).toBe('QUARANTINED · DO NOT FIT')
    expect(labelWarningOf({ ...LOT, status: 'rejected' })).toBe('REJECTED · DO NOT FIT')
    expect(labelWarningOf({ ...LOT, expiresOn: '2026-11-30', isExpired: true })).toBe(
      'EXPIRED 2026-11-30 · DO NOT FIT',
    )
    expect(labelWarningOf({ ...LOT, status: 'quarantined', isExpired: true })).toBe(
      'QUARANTINED · EXPIRED · DO NOT FIT',
    )
  })
})

describe('componentLotLabelPdf', () => {
  it('prints a usable lot without a warning, its QR opening /c/<code>', async () => {
    const { text, qr } = await textAndQr(await componentLotLabelPdf(LOT, BASE_URL))
    expect(text).toContain(LOT.internalCode)
    expect(text).not.toMatch(/DO NOT FIT/)
    expect(qr).toBe(componentLotUrl(BASE_URL, LOT.internalCode))
  })
  it('says on the label that a quarantined lot may not be fitted, QR still readable', async () => {
    const lot = { ...LOT, status: 'quarantined' as const }
    const { text, qr } = await textAndQr(await componentLotLabelPdf(lot, BASE_URL))
    expect(text).toContain('QUARANTINED · DO NOT FIT')
    expect(text).toContain(LOT.internalCode)
    expect(text).toContain('Example Ferrites')
    expect(qr).toBe(componentLotUrl(BASE_URL, LOT.internalCode))
  })
  it('says on the label that an expired lot is expired', async () => {
    const lot = { ...LOT, expiresOn: '2026-11-30', isExpired: true }
    const { text } = await textAndQr(await componentLotLabelPdf(lot, BASE_URL))
    expect(text).toContain('EXPIRED 2026-11-30 · DO NOT FIT')
  })
})
