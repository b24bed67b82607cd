import { FONT, MM } from './pdf'
import { drawLine } from './pdfText'
import type { TextStyle } from './pdfText'

// The lot report's page: A4 geometry, colours and type styles, a cursor that breaks pages, and
// the headings, tables and number formats every section of the report uses.

export const W = 595.28
export const H = 841.89
export const M = 16 * MM
export const CONTENT = W - 2 * M
export const FOOTER_TOP = H - 16 * MM
export const BOTTOM = FOOTER_TOP - 4 * MM

export const INK = '#1d2b36'
export const MUTED = '#5f6b73'
export const RULE = '#b9c2c8'
export const BAR = '#2f6f8f'
export const WHISKER = '#0f2a3a'
export const WARN = '#b23a2e'
export const CUMULATIVE = '#c47f17'

export const S = {
  title: { font: FONT.bold, size: 18, color: INK },
  h2: { font: FONT.bold, size: 11.5, color: INK },
  body: { font: FONT.regular, size: 9, color: INK },
  bodyBold: { font: FONT.medium, size: 9, color: INK },
  small: { font: FONT.regular, size: 7.5, color: MUTED },
  smallInk: { font: FONT.regular, size: 7.5, color: INK },
  tableHead: { font: FONT.medium, size: 7.5, color: MUTED },
  cell: { font: FONT.regular, size: 8, color: INK },
} satisfies Record<string, TextStyle>

/** A fraction as a percentage with one decimal, e.g. 0.8 → "80.0 %"; null → "—". */
export function pct(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '—' : `${(v * 100).toFixed(1)} %`
}

/** A 95 % interval of fractions as "71.2 – 93.4 %". */
export function pctRange(i: { low: number; high: number }): string {
  return `${(i.low * 100).toFixed(1)} – ${(i.high * 100).toFixed(1)} %`
}

/** A number with `d` decimals, "—" for null. */
export function num(v: number | null | undefined, d = 2): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(d)
}

export const day = (d: Date | string | null) =>
  d === null ? '—' : (typeof d === 'string' ? d : d.toISOString()).slice(0, 10)
export const minute = (d: Date | null) =>
  d === null ? '—' : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`

/** Where the next section starts on the current page; starts new pages as needed. */
export class Cursor {
  y = M
  constructor(private readonly doc: PDFKit.PDFDocument) {}
  newPage() {
    this.doc.addPage({ size: 'A4', margin: 0 })
    this.y = M
  }
  /** Starts a new page unless `height` still fits on this one. */
  need(height: number) {
    if (this.y + height > BOTTOM) this.newPage()
  }
}

/** A section heading with an optional note on the right, ruled underneath. */
export function heading(doc: PDFKit.PDFDocument, c: Cursor, text: string, note = '') {
  c.need(40)
  c.y += 4
  drawLine(doc, text, M, c.y, S.h2)
  if (note) drawLine(doc, note, M, c.y + 3, S.small, { width: CONTENT, align: 'right' })
  c.y += 16
  rule(doc, c.y)
  c.y += 6
}

/** A hairline across the content width at height `y`. */
export function rule(doc: PDFKit.PDFDocument, y: number, lineWidth = 0.5) {
  doc
    .moveTo(M, y)
    .lineTo(W - M, y)
    .lineWidth(lineWidth)
    .strokeColor(RULE)
    .stroke()
}

/** The line a section shows in place of its table or chart when it has nothing to show. */
export function nothingToShow(doc: PDFKit.PDFDocument, c: Cursor, text: string) {
  drawLine(doc, text, M, c.y, S.body)
  c.y += 16
}

export interface Column {
  title: string
  width: number
  align?: 'left' | 'right'
}

/** A table that continues on the next page, repeating its head, with rows of one line. */
export function table(doc: PDFKit.PDFDocument, c: Cursor, cols: Column[], rows: string[][]) {
  const rowH = 12.5
  const head = () => {
    let x = M
    for (const col of cols) {
      drawLine(doc, col.title, x, c.y, S.tableHead, {
        width: col.width - 4,
        align: col.align ?? 'left',
      })
      x += col.width
    }
    c.y += rowH
    rule(doc, c.y - 3, 0.4)
  }
  c.need(rowH * 2)
  head()
  for (const row of rows) {
    if (c.y + rowH > BOTTOM) {
      c.newPage()
      head()
    }
    let x = M
    row.forEach((cell, i) => {
      const col = cols[i]!
      drawLine(doc, cell, x, c.y, S.cell, { width: col.width - 4, align: col.align ?? 'left' })
      x += col.width
    })
    c.y += rowH
  }
  c.y += 4
}
