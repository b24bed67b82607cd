import { createRequire } from 'node:module'
import PDFDocument from 'pdfkit'
import QRCode from 'qrcode'

const require = createRequire(import.meta.url)
const fontFile = (weight: number) =>
  require.resolve(`@fontsource/roboto-condensed/files/roboto-condensed-latin-${weight}-normal.woff`)

/** Font names registered on every Waymark PDF (Roboto Condensed, embedded). */
export const FONT = { regular: 'Body', medium: 'BodyMedium', bold: 'BodyBold' } as const

export const MM = 72 / 25.4

/**
 * A new PDF with Roboto Condensed embedded. The .woff files are used, not .woff2: pdfkit's font
 * reader fails on some .woff2 glyph tables.
 */
export function newPdf(options: PDFKit.PDFDocumentOptions): PDFKit.PDFDocument {
  const doc = new PDFDocument({ autoFirstPage: false, ...options })
  doc.registerFont(FONT.regular, fontFile(400))
  doc.registerFont(FONT.medium, fontFile(500))
  doc.registerFont(FONT.bold, fontFile(700))
  return doc
}

/** Collects a finished PDF into one buffer. */
export function pdfBuffer(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
    doc.end()
  })
}

/** A QR code as PNG, medium error correction so a scuffed label still scans. */
export function qrPng(payload: string): Promise<Buffer> {
  return QRCode.toBuffer(payload, { type: 'png', errorCorrectionLevel: 'M', margin: 2, scale: 6 })
}
