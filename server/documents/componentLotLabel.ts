import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { componentLotUrl } from '../../shared/links'
import { FONT, MM, newPdf, pdfBuffer, qrPng } from './pdf'

/**
 * What a label printed now must warn of, or null for a lot that may be fitted: a lot on hold,
 * refused, or past its expiry date must not reach a bench looking like a good one. The
 * warning is upper-case words, not a colour, because labels come off monochrome printers.
 */
export function labelWarningOf(
  lot: Pick<ComponentLotDto, 'status' | 'isExpired' | 'expiresOn'>,
): string | null {
  if (lot.status === 'rejected') return 'REJECTED · DO NOT FIT'
  if (lot.status === 'quarantined') {
    return lot.isExpired ? 'QUARANTINED · EXPIRED · DO NOT FIT' : 'QUARANTINED · DO NOT FIT'
  }
  // isExpired is only ever true with an expiry date.
  if (lot.isExpired) return `EXPIRED ${lot.expiresOn} · DO NOT FIT`
  return null
}

/**
 * One 100 × 50 mm label for a component lot: the QR of `<base>/c/<code>` at the left, the
 * internal code large enough to read across a bench, and what stores needs to find the lot.
 * A lot that may not be fitted (labelWarningOf) gets a black band across the top that says
 * why, and the rest moves down to make room.
 */
export async function componentLotLabelPdf(lot: ComponentLotDto, baseUrl: string): Promise<Buffer> {
  const width = 100 * MM
  const height = 50 * MM
  const warning = labelWarningOf(lot)
  const doc = newPdf({
    size: [width, height],
    margin: 0,
    info: { Title: `Component lot ${lot.internalCode}` },
  })
  doc.addPage({ size: [width, height], margin: 0 })
  const top = warning ? 8 * MM : 0
  if (warning) {
    doc.rect(0, 0, width, 7 * MM).fill('#000')
    doc
      .fillColor('#fff')
      .font(FONT.bold)
      .fontSize(12)
      .text(warning, 3 * MM, 1.6 * MM, { width: width - 6 * MM, align: 'center', lineBreak: false })
      .fillColor('#000')
  }
  const qrSize = warning ? 36 * MM : 42 * MM
  doc.image(await qrPng(componentLotUrl(baseUrl, lot.internalCode)), 3 * MM, 4 * MM + top / 2, {
    width: qrSize,
  })
  const x = qrSize + 6 * MM
  const w = width - x - 3 * MM
  doc
    .font(FONT.bold)
    .fontSize(17)
    .text(lot.internalCode, x, 5 * MM + top / 2, { width: w })
  doc
    .font(FONT.medium)
    .fontSize(10)
    .text(lot.partNumber, x, 13 * MM + top / 2, { width: w })
  doc
    .font(FONT.regular)
    .fontSize(8)
    .text(lot.partDescription, { width: w, height: warning ? 4 * MM : 8 * MM, ellipsis: true })
  const rows = [
    ['Supplier', lot.supplierName],
    ['Supplier lot', lot.supplierLotCode],
    ['Received', lot.receivedOn],
    ['Expires', lot.expiresOn ?? '—'],
    ['Quantity', `${lot.quantityReceived} ${lot.unitOfMeasure}`],
  ]
  let y = 27 * MM + top / 2
  const step = warning ? 3.5 * MM : 4 * MM
  for (const [label, value] of rows) {
    doc
      .font(FONT.regular)
      .fontSize(7)
      .text(label!, x, y, { width: 16 * MM })
    doc
      .font(FONT.medium)
      .fontSize(7)
      .text(value!, x + 16 * MM, y, { width: w - 16 * MM, lineBreak: false, ellipsis: true })
    y += step
  }
  return pdfBuffer(doc)
}
