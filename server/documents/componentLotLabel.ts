import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import { componentLotUrl } from '../../shared/links'
import { FONT, MM, newPdf, pdfBuffer, qrPng } from './pdf'

/**
 * One 100 × 50 mm label for a component lot: the QR of `<base>/c/<code>` at the left, the
 * internal code large enough to read across a bench, and what stores needs to find the lot.
 */
export async function componentLotLabelPdf(lot: ComponentLotDto, baseUrl: string): Promise<Buffer> {
  const width = 100 * MM
  const height = 50 * MM
  const doc = newPdf({
    size: [width, height],
    margin: 0,
    info: { Title: `Component lot ${lot.internalCode}` },
  })
  doc.addPage({ size: [width, height], margin: 0 })
  const qrSize = 42 * MM
  doc.image(await qrPng(componentLotUrl(baseUrl, lot.internalCode)), 3 * MM, 4 * MM, {
    width: qrSize,
  })
  const x = 48 * MM
  const w = width - x - 3 * MM
  doc
    .font(FONT.bold)
    .fontSize(17)
    .text(lot.internalCode, x, 5 * MM, { width: w })
  doc
    .font(FONT.medium)
    .fontSize(10)
    .text(lot.partNumber, x, 13 * MM, { width: w })
  doc
    .font(FONT.regular)
    .fontSize(8)
    .text(lot.partDescription, { width: w, height: 8 * MM, ellipsis: true })
  const rows = [
    ['Supplier', lot.supplierName],
    ['Supplier lot', lot.supplierLotCode],
    ['Received', lot.receivedOn],
    ['Expires', lot.expiresOn ?? '—'],
    ['Quantity', `${lot.quantityReceived} ${lot.unitOfMeasure}`],
  ]
  let y = 27 * MM
  for (const [label, value] of rows) {
    doc
      .font(FONT.regular)
      .fontSize(7)
      .text(label!, x, y, { width: 16 * MM })
    doc
      .font(FONT.medium)
      .fontSize(7)
      .text(value!, x + 16 * MM, y, { width: w - 16 * MM, lineBreak: false, ellipsis: true })
    y += 4 * MM
  }
  return pdfBuffer(doc)
}
