import { FONT, MM, newPdf } from './pdf'
import { fixedPdfInfo } from './pdfInfo'
import { drawLine, drawText, registerGreekFonts, textHeight } from './pdfText'
import type { TextStyle } from './pdfText'

/** A4 portrait geometry of a customer paper (certificate, packing slip), in points. */
export const SHEET = {
  width: 210 * MM,
  height: 297 * MM,
  margin: 16 * MM,
  footerTop: 279 * MM,
}
export const SHEET_WIDTH = SHEET.width - 2 * SHEET.margin

export const INK = { text: '#111111', grey: '#5a5a5a', rule: '#9a9a9a', band: '#ececec' }

export const PAPER_STYLE = {
  kicker: { font: FONT.bold, size: 8, color: INK.grey },
  title: { font: FONT.bold, size: 20, color: INK.text },
  heading: { font: FONT.bold, size: 11, color: INK.text },
  label: { font: FONT.regular, size: 7, color: INK.grey },
  value: { font: FONT.medium, size: 9.5, color: INK.text },
  body: { font: FONT.regular, size: 9, color: INK.text },
  cell: { font: FONT.regular, size: 8, color: INK.text },
  cellBold: { font: FONT.medium, size: 8, color: INK.text },
  head: { font: FONT.bold, size: 7, color: INK.grey },
  small: { font: FONT.regular, size: 7, color: '#333333' },
} satisfies Record<string, TextStyle>

/** One column of a table: a share of the sheet width, and how its text is set. */
export interface Column {
  title: string
  width: number
  align?: 'left' | 'right' | 'center'
  style?: TextStyle
}

/**
 * Lays text and tables down A4 pages from top to bottom, starting a new page (with the running
 * head and foot) whenever the next piece would not fit above the foot.
 */
export class PaperWriter {
  y = 0
  page = 0

  constructor(
    readonly doc: PDFKit.PDFDocument,
    /** Draws the running head of pages after the first and returns where the body starts. */
    private readonly runningHead: (doc: PDFKit.PDFDocument, page: number) => number,
    /** Draws the foot of every page once all are laid out (the foot says "page 2 of 5"). */
    private readonly foot: (doc: PDFKit.PDFDocument, page: number, pageCount: number) => void,
  ) {}

  /** Draws every page's foot; the document must be made with `bufferPages: true`. */
  finish(): void {
    const range = this.doc.bufferedPageRange()
    for (let i = range.start; i < range.start + range.count; i++) {
      this.doc.switchToPage(i)
      this.foot(this.doc, i - range.start + 1, range.count)
    }
  }

  /** Starts a page; the first page's head is the caller's to draw. */
  newPage(): void {
    this.doc.addPage({ size: 'A4', margin: 0 })
    this.page += 1
    this.y = this.page === 1 ? SHEET.margin : this.runningHead(this.doc, this.page)
  }

  /** The first page's head: the shop, the paper's number on the right, its title, a bar. */
  firstHead(shopName: string, number: string, title: string): void {
    const { doc } = this
    const x = SHEET.margin
    drawLine(doc, shopName.toUpperCase(), x, this.y, PAPER_STYLE.kicker, { characterSpacing: 0.8 })
    drawLine(doc, `No. ${number}`, x, this.y, PAPER_STYLE.kicker, {
      width: SHEET_WIDTH,
      align: 'right',
    })
    this.y += 5 * MM
    drawLine(doc, title, x, this.y, PAPER_STYLE.title)
    this.y += 10 * MM
    doc.rect(x, this.y, SHEET_WIDTH, 1.2).fill(INK.text)
    this.y += 4 * MM
  }

  /** Makes sure `height` points fit above the foot, else starts a new page. */
  need(height: number): void {
    if (this.y + height > SHEET.footerTop - 3 * MM) this.newPage()
  }

  heading(text: string, gapBefore = 5 * MM): void {
    this.need(gapBefore + 14 * MM) // never leave a heading alone at the foot of a page
    this.y += gapBefore
    drawLine(this.doc, text, SHEET.margin, this.y, PAPER_STYLE.heading)
    this.y += 5 * MM
  }

  paragraph(text: string, style: TextStyle = PAPER_STYLE.body, gapAfter = 2 * MM): void {
    const h = textHeight(this.doc, text, style, SHEET_WIDTH)
    this.need(h)
    drawText(this.doc, text, SHEET.margin, this.y, style, { width: SHEET_WIDTH, lineGap: 1 })
    this.y += h + gapAfter
  }

  /** Label-over-value fields in a grid of `columns`; a third item spans that many columns. */
  fields(items: [string, string, number?][], columns = 4): void {
    const w = SHEET_WIDTH / columns
    let column = 0
    this.need(9 * MM)
    for (const [name, text, span = 1] of items) {
      if (column + span > columns) {
        this.y += 9 * MM
        this.need(9 * MM)
        column = 0
      }
      const x = SHEET.margin + column * w
      drawLine(this.doc, name, x, this.y, PAPER_STYLE.label)
      drawLine(this.doc, text || '—', x, this.y + 3 * MM, PAPER_STYLE.value, {
        width: span * w - 2 * MM,
      })
      column += span
    }
    this.y += 9 * MM
  }

  rule(weight = 0.6, color = INK.rule): void {
    this.doc
      .moveTo(SHEET.margin, this.y)
      .lineTo(SHEET.margin + SHEET_WIDTH, this.y)
      .lineWidth(weight)
      .strokeColor(color)
      .stroke()
  }

  /**
   * A table with a grey head row, repeated on each page it runs onto. Cells wrap; a row is never
   * split across pages.
   */
  table(columns: Column[], rows: string[][], options: { keepHeadWith?: number } = {}): void {
    const total = columns.reduce((s, c) => s + c.width, 0)
    const widths = columns.map((c) => (c.width / total) * SHEET_WIDTH)
    const pad = 1.3 * MM
    const heightOf = (row: string[], style: (c: Column) => TextStyle) =>
      Math.max(
        ...row.map((text, i) =>
          textHeight(this.doc, text, style(columns[i]!), widths[i]! - 2 * pad),
        ),
      ) +
      2 * pad
    const drawRow = (row: string[], style: (c: Column) => TextStyle, isHead: boolean) => {
      const h = heightOf(row, style)
      if (isHead) this.doc.rect(SHEET.margin, this.y, SHEET_WIDTH, h).fill(INK.band)
      let x = SHEET.margin
      row.forEach((text, i) => {
        const col = columns[i]!
        drawText(this.doc, text, x + pad, this.y + pad, style(col), {
          width: widths[i]! - 2 * pad,
          align: col.align ?? 'left',
        })
        x += widths[i]!
      })
      this.y += h
      this.rule(isHead ? 0.8 : 0.3, isHead ? '#777777' : '#c8c8c8')
    }
    const headStyle = () => PAPER_STYLE.head
    const cellStyle = (c: Column) => c.style ?? PAPER_STYLE.cell
    const head = columns.map((c) => c.title)
    const headHeight = heightOf(head, headStyle)
    const firstRows = rows.slice(0, options.keepHeadWith ?? 1)
    this.need(headHeight + firstRows.reduce((s, r) => s + heightOf(r, cellStyle), 0))
    drawRow(head, headStyle, true)
    for (const row of rows) {
      const h = heightOf(row, cellStyle)
      if (this.y + h > SHEET.footerTop - 3 * MM) {
        this.newPage()
        drawRow(head, headStyle, true)
      }
      drawRow(row, cellStyle, false)
    }
  }
}

/**
 * A new A4 customer paper: the PDF, its writer, the "(continued)" head of every later page and
 * the footer rule with `footer` and "Page n of m". `title` names the paper in the PDF's info
 * and its running head, e.g. "Packing slip S-0007".
 */
export function customerPaper(
  title: string,
  footer: string,
  issuedAt: Date,
): { doc: PDFKit.PDFDocument; w: PaperWriter } {
  const doc = newPdf({
    size: 'A4',
    margin: 0,
    bufferPages: true,
    info: fixedPdfInfo(title, issuedAt),
  })
  registerGreekFonts(doc)
  const w = new PaperWriter(
    doc,
    (d) => {
      drawLine(d, `${title} (continued)`, SHEET.margin, SHEET.margin, PAPER_STYLE.kicker)
      return SHEET.margin + 7 * MM
    },
    (d, page, count) => {
      const y = SHEET.footerTop
      d.moveTo(SHEET.margin, y)
        .lineTo(SHEET.margin + SHEET_WIDTH, y)
        .lineWidth(0.5)
        .strokeColor(INK.rule)
        .stroke()
      drawLine(d, footer, SHEET.margin, y + 2 * MM, PAPER_STYLE.small)
      drawLine(d, `Page ${page} of ${count}`, SHEET.margin, y + 2 * MM, PAPER_STYLE.small, {
        width: SHEET_WIDTH,
        align: 'right',
      })
    },
  )
  return { doc, w }
}
