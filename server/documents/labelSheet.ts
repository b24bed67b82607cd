import { unitUrl } from '../../shared/links'
import { FONT, MM, newPdf, pdfBuffer } from './pdf'
import { fixedPdfInfo } from './pdfInfo'
import { drawLine, registerGreekFonts, textWidth } from './pdfText'
import type { TextStyle } from './pdfText'
import { drawQr } from './qrVector'

export type LabelLayout = 'a4_3x8' | 'thermal_50x25'

/** A label stock: its page, the label size and the grid of labels on one page (mm). */
export interface LabelStock {
  label: string
  pageMm: [number, number]
  labelMm: [number, number]
  columns: number
  rows: number
  /** Largest serial type size, in points; the serial shrinks from here until it fits. */
  maxSerialPt: number
}

/** The label stocks Waymark prints on, by the name the lot screen offers. */
export const LABEL_LAYOUTS: Record<LabelLayout, LabelStock> = {
  a4_3x8: {
    label: 'A4 sheet, 3 × 8 labels (70 × 37 mm)',
    pageMm: [210, 297],
    labelMm: [70, 37],
    columns: 3,
    rows: 8,
    maxSerialPt: 16,
  },
  thermal_50x25: {
    label: 'Thermal roll, 50 × 25 mm',
    pageMm: [50, 25],
    labelMm: [50, 25],
    columns: 1,
    rows: 1,
    maxSerialPt: 12,
  },
}

/** Nothing is printed closer than this to a label's edge: die-cut and roll labels shift. */
export const SAFE_MARGIN_MM = 2

/** Top-left corner (points) of label `index` on its page; the grid is centred on the page. */
export function labelOrigin(stock: LabelStock, index: number): { x: number; y: number } {
  const [pageW, pageH] = stock.pageMm
  const [w, h] = stock.labelMm
  const left = (pageW - stock.columns * w) / 2
  const top = (pageH - stock.rows * h) / 2
  const slot = index % (stock.columns * stock.rows)
  const column = slot % stock.columns
  const row = Math.floor(slot / stock.columns)
  return { x: (left + column * w) * MM, y: (top + row * h) * MM }
}

interface LabelText {
  serial: string
  productCode: string
  lotNumber: string
  url: string
}

function drawLabel(
  doc: PDFKit.PDFDocument,
  stock: LabelStock,
  origin: { x: number; y: number },
  text: LabelText,
): void {
  const safe = SAFE_MARGIN_MM * MM
  const [w, h] = stock.labelMm.map((mm) => mm * MM) as [number, number]
  const qrSize = h - 2 * safe
  drawQr(doc, text.url, origin.x + safe, origin.y + safe, qrSize)
  const x = origin.x + safe + qrSize + 1.5 * MM
  const width = origin.x + w - safe - x
  // The serial is never cut: it shrinks until it fits, with 2 % to spare for rounding.
  const serialStyle: TextStyle = { font: FONT.bold, size: 10 }
  const fitted = (0.98 * width * serialStyle.size) / textWidth(doc, text.serial, serialStyle)
  serialStyle.size = Math.min(stock.maxSerialPt, fitted)
  // Product and lot stay legible (6.5 pt at least) even when a long serial shrinks.
  const small: TextStyle = {
    font: FONT.medium,
    size: Math.max(6.5, Math.min(9, serialStyle.size * 0.75)),
  }
  const lot: TextStyle = { ...small, font: FONT.regular }
  // Serial, product and lot as one block, centred beside the QR.
  const lines = [
    { line: text.serial, style: serialStyle, height: serialStyle.size * 1.25, fit: {} },
    { line: text.productCode, style: small, height: small.size * 1.3, fit: { width } },
    { line: `Lot ${text.lotNumber}`, style: lot, height: lot.size * 1.2, fit: { width } },
  ]
  let y = origin.y + (h - lines.reduce((sum, l) => sum + l.height, 0)) / 2
  for (const { line, style, height, fit } of lines) {
    drawLine(doc, line, x, y, style, fit)
    y += height
  }
}

/** Input of one label print run: one label per serial, in the order given. */
export interface LabelSheetData {
  productCode: string
  lotNumber: string
  serials: string[]
  baseUrl: string
  layout: LabelLayout
  /** Fixed per lot: the PDF's creation date, so a rerun gives the same bytes. */
  issuedAt: Date
}

/**
 * Unit labels as a PDF: on A4 stock 24 labels to a page, on a thermal roll one page per label.
 * Each label carries the unit's QR (unitUrl), the serial as large as fits, product and lot.
 * @param onProgress awaited after each page with the share of labels done, ending at 1
 */
export async function labelSheetPdf(
  data: LabelSheetData,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<Buffer> {
  if (!data.serials.length) throw new RangeError('a label sheet needs at least one serial')
  const stock = LABEL_LAYOUTS[data.layout]
  const size: [number, number] = [stock.pageMm[0] * MM, stock.pageMm[1] * MM]
  const perPage = stock.columns * stock.rows
  const doc = newPdf({
    size,
    margin: 0,
    info: fixedPdfInfo(`Unit labels, lot ${data.lotNumber}`, data.issuedAt),
  })
  registerGreekFonts(doc)
  for (const [i, serial] of data.serials.entries()) {
    if (i % perPage === 0) doc.addPage({ size, margin: 0 })
    const url = unitUrl(data.baseUrl, serial)
    const text = { serial, productCode: data.productCode, lotNumber: data.lotNumber, url }
    drawLabel(doc, stock, labelOrigin(stock, i), text)
    const isPageDone = (i + 1) % perPage === 0 || i + 1 === data.serials.length
    if (isPageDone) await onProgress?.((i + 1) / data.serials.length)
  }
  return pdfBuffer(doc)
}
