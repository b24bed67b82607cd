import { FONT, MM, newPdf, pdfBuffer, qrPng } from './pdf'

/** What a person's badge shows. */
export interface BadgeData {
  name: string
  role: string
  badgeCode: string
  shopName: string
}

/**
 * One card-size badge (85.6 × 54 mm, the ISO/IEC 7810 ID-1 size that fits a card holder): the
 * QR of the badge code at the left, large enough for a hand scanner at arm's length, the name
 * and role at the right. The code alone signs nothing: the bench also asks for the PIN.
 */
export async function badgePdf(data: BadgeData): Promise<Buffer> {
  const width = 85.6 * MM
  const height = 54 * MM
  const doc = newPdf({ size: [width, height], margin: 0, info: { Title: `Badge ${data.name}` } })
  doc.addPage({ size: [width, height], margin: 0 })
  doc
    .lineWidth(0.5)
    .roundedRect(1 * MM, 1 * MM, width - 2 * MM, height - 2 * MM, 3 * MM)
    .stroke('#9aa39a')
  const qrSize = 40 * MM
  doc.image(await qrPng(data.badgeCode), 3 * MM, 7 * MM, { width: qrSize })
  const x = 46 * MM
  const w = width - x - 4 * MM
  doc
    .fillColor('#3d4a3f')
    .font(FONT.medium)
    .fontSize(7)
    .text(data.shopName.toUpperCase(), x, 6 * MM, {
      width: w,
      characterSpacing: 0.6,
    })
  doc
    .fillColor('#000')
    .font(FONT.bold)
    .fontSize(15)
    .text(data.name, x, 12 * MM, { width: w, height: 16 * MM, ellipsis: true })
  doc
    .font(FONT.medium)
    .fontSize(10)
    .text(data.role, x, 30 * MM, { width: w })
  doc
    .fillColor('#555')
    .font(FONT.regular)
    .fontSize(6.5)
    .text('Second signature at the bench: scan this badge, then type your PIN.', x, 38 * MM, {
      width: w,
    })
  doc.fontSize(5.5).text(data.badgeCode, 3 * MM, 48 * MM, { width: qrSize, align: 'center' })
  return pdfBuffer(doc)
}
