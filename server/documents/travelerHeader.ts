import { FONT, MM } from './pdf'
import { drawLine, drawText, textWidth } from './pdfText'
import { drawQr } from './qrVector'
import type { TextStyle } from './pdfText'
import { PAGE, TABLE_WIDTH } from './travelerLayout'

/** What the header and footer of one traveler sheet show. */
export interface SheetInfo {
  serial: string
  productCode: string
  productName: string
  revision: string
  lotNumber: string
  orderRef: string
  customerName: string
  dueDate: string | null
  issuedOn: string
  stepCount: number
  sheet: number
  sheetCount: number
  /** What the QR holds: the unit's URL. */
  qrPayload: string
}

export const QR_SIZE = 38 * MM
const GREY = '#555555'
const label: TextStyle = { font: FONT.regular, size: 7, color: GREY }
const value: TextStyle = { font: FONT.medium, size: 10 }

/**
 * The top of every sheet: the serial in 30 pt beside its QR, so an operator can read it across a
 * bench and a scanner finds it at once; then product, revision and the lot's order details.
 */
export function drawHeader(doc: PDFKit.PDFDocument, info: SheetInfo): void {
  const x = PAGE.margin
  const top = PAGE.margin
  const qrX = PAGE.width - PAGE.margin - QR_SIZE
  const textW = qrX - x - 4 * MM
  const kicker: TextStyle = { font: FONT.bold, size: 8, color: GREY }
  drawLine(doc, 'BUILD TRAVELER · UNIT SERIAL', x, top, kicker, { characterSpacing: 0.6 })
  drawLine(doc, info.serial, x, top + 3.6 * MM, { font: FONT.bold, size: 30 }, { width: textW })
  const codeStyle: TextStyle = { font: FONT.bold, size: 12 }
  const productY = top + 17.5 * MM
  drawLine(doc, info.productCode, x, productY, codeStyle)
  const nameX = x + textWidth(doc, info.productCode, codeStyle) + 2.5 * MM
  drawLine(
    doc,
    info.productName,
    nameX,
    productY,
    { font: FONT.regular, size: 12 },
    {
      width: x + textW - nameX,
    },
  )
  const fields: [string, string][] = [
    ['Revision', info.revision],
    ['Lot', info.lotNumber],
    ['Order', info.orderRef || '—'],
    ['Customer', info.customerName || '—'],
    ['Due', info.dueDate ?? '—'],
    ['Issued', info.issuedOn],
    ['Route', `${info.stepCount} ${info.stepCount === 1 ? 'step' : 'steps'}`],
    ['Sheet', `${info.sheet} of ${info.sheetCount}`],
  ]
  // Revision and dates are short; the customer's name gets the widest cell.
  const cells = [22 * MM, 34 * MM, 34 * MM]
  cells.push(textW - cells[0]! - cells[1]! - cells[2]!)
  fields.forEach(([name, text], i) => {
    const column = i % 4
    const cx = x + cells.slice(0, column).reduce((sum, w) => sum + w, 0)
    const cy = top + 24.5 * MM + Math.floor(i / 4) * 9 * MM
    drawLine(doc, name, cx, cy, label)
    drawLine(doc, text, cx, cy + 3 * MM, value, { width: cells[column]! - 2 * MM })
  })
  drawQr(doc, info.qrPayload, qrX, top, QR_SIZE)
  drawLine(doc, 'Scan at every station', qrX, top + QR_SIZE + 0.6 * MM, label, {
    width: QR_SIZE,
    align: 'center',
  })
  const ruleY = top + 43.5 * MM
  doc
    .moveTo(x, ruleY)
    .lineTo(x + TABLE_WIDTH, ruleY)
    .lineWidth(1.4)
    .strokeColor('#000000')
    .stroke()
}

/** The foot of every sheet: who governs high-voltage work, and where this sheet belongs. */
export function drawFooter(doc: PDFKit.PDFDocument, info: SheetInfo): void {
  const x = PAGE.margin
  const y = PAGE.footerTop
  doc
    .moveTo(x, y)
    .lineTo(x + TABLE_WIDTH, y)
    .lineWidth(0.6)
    .strokeColor('#777777')
    .stroke()
  const small: TextStyle = { font: FONT.regular, size: 7.5, color: '#333333' }
  drawText(
    doc,
    'Hipot and load tests involve lethal voltages. The applicable safety standard, local codes and licensed practice govern; Waymark records results and does not certify a design.',
    x,
    y + 1.4 * MM,
    small,
    { width: TABLE_WIDTH },
  )
  const where = `${info.productCode} rev ${info.revision} · lot ${info.lotNumber} · ${info.serial}`
  const lineY = y + 5.4 * MM
  drawLine(doc, where, x, lineY, { ...small, font: FONT.medium }, { width: TABLE_WIDTH - 30 * MM })
  const sheet = `Sheet ${info.sheet} of ${info.sheetCount}`
  drawLine(doc, sheet, x, lineY, small, { width: TABLE_WIDTH, align: 'right' })
}
