import QRCode from 'qrcode'

/** White modules kept around the symbol, as qrPng() does; the label or page adds more white. */
const QUIET_MODULES = 2

/**
 * Draws a QR code (error correction M, like qrPng) as filled vector rectangles, one per run of
 * dark modules in a row. Vector modules print with sharp edges at any printer resolution, and
 * they keep the PDF deterministic: pdfkit splits the alpha channel of a PNG in an asynchronous
 * inflate, so with many PNGs in flight the PDF object numbers depended on timing and two runs
 * of one label sheet differed.
 */
export function drawQr(
  doc: PDFKit.PDFDocument,
  payload: string,
  x: number,
  y: number,
  size: number,
): void {
  const { modules } = QRCode.create(payload, { errorCorrectionLevel: 'M' })
  const cell = size / (modules.size + 2 * QUIET_MODULES)
  const at = (i: number) => (i + QUIET_MODULES) * cell
  doc.save()
  doc.rect(x, y, size, size).fillColor('#ffffff').fill()
  for (let row = 0; row < modules.size; row++) {
    let col = 0
    while (col < modules.size) {
      if (!modules.get(row, col)) {
        col++
        continue
      }
      const start = col
      while (col < modules.size && modules.get(row, col)) col++
      // A hair of overlap downwards so anti-aliased viewers show no seams between rows.
      doc.rect(x + at(start), y + at(row), (col - start) * cell, cell + 0.05)
    }
  }
  doc.fillColor('#000000').fill()
  doc.restore()
}
