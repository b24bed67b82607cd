import { DOCUMENT_KIND_LABELS, UNIT_STATE_LABELS } from '../../shared/lots'
import { HIGH_VOLTAGE_CAUTION } from '../../shared/safety/hipot'
import type { TraceStepRunDto, UnitTraceDto } from '../../shared/schemas/trace'
import { traceLimitText, traceValueText } from '../../shared/traceWords'
import { FONT, MM, newPdf, pdfBuffer } from './pdf'
import { drawLine, drawText, registerGreekFonts, textHeight } from './pdfText'
import type { TextStyle } from './pdfText'

const PAGE = { width: 210 * MM, height: 297 * MM, margin: 14 * MM, footer: 20 * MM }
const WIDTH = PAGE.width - 2 * PAGE.margin
const GREY = '#555555'
const small: TextStyle = { font: FONT.regular, size: 7.5, color: GREY }
const body: TextStyle = { font: FONT.regular, size: 9 }
const strong: TextStyle = { font: FONT.medium, size: 9 }
const heading: TextStyle = { font: FONT.bold, size: 11 }

const HV_KINDS = new Set(['hipot', 'load_test'])
const when = (iso: string | null) => (iso ? iso.slice(0, 16).replace('T', ' ') + ' UTC' : '—')

/** Writes top to bottom, starting a new page when the next block would not fit. */
class Cursor {
  y = PAGE.margin
  constructor(readonly doc: PDFKit.PDFDocument) {}
  room(height: number) {
    if (this.y + height <= PAGE.height - PAGE.footer) return
    this.doc.addPage({ size: 'A4', margin: 0 })
    this.y = PAGE.margin
  }
  heading(text: string) {
    this.room(14 * MM)
    this.y += 3 * MM
    drawLine(this.doc, text, PAGE.margin, this.y, heading)
    this.y += 5.5 * MM
    this.doc
      .moveTo(PAGE.margin, this.y - 1.2 * MM)
      .lineTo(PAGE.margin + WIDTH, this.y - 1.2 * MM)
      .lineWidth(0.4)
      .strokeColor('#999999')
      .stroke()
  }
  /** One row of cells: [text, width share, style]; wraps inside each cell. */
  row(cells: [string, number, TextStyle?][]) {
    const widths = cells.map(([, share]) => share * WIDTH)
    const h = Math.max(
      ...cells.map(([text, , style], i) =>
        textHeight(this.doc, text, style ?? body, widths[i]! - 2),
      ),
    )
    this.room(h + 1.2 * MM)
    let x = PAGE.margin
    cells.forEach(([text, , style], i) => {
      drawText(this.doc, text, x, this.y, style ?? body, { width: widths[i]! - 2 })
      x += widths[i]!
    })
    this.y += h + 1.2 * MM
  }
  /** A table's head: its column titles in small type, with their width shares. */
  head(titles: [string, number][]) {
    this.row(titles.map(([title, share]) => [title, share, small]))
  }
  text(text: string, style: TextStyle = body) {
    const h = textHeight(this.doc, text, style, WIDTH)
    this.room(h + 1 * MM)
    drawText(this.doc, text, PAGE.margin, this.y, style, { width: WIDTH })
    this.y += h + 1 * MM
  }
}

function header(c: Cursor, t: UnitTraceDto) {
  const { doc } = c
  drawLine(doc, 'UNIT HISTORY RECORD', PAGE.margin, c.y, { font: FONT.bold, size: 8, color: GREY })
  drawLine(doc, t.unit.serial, PAGE.margin, c.y + 3.5 * MM, { font: FONT.bold, size: 24 })
  c.y += 14 * MM
  const fields: [string, string][] = [
    ['Product', `${t.product.code} ${t.product.name}`],
    ['Revision', `${t.revision.letter} (${t.revision.status})`],
    ['Lot', t.lot.number],
    ['State', UNIT_STATE_LABELS[t.unit.state]],
    ['Order', t.lot.orderRef || '—'],
    ['Customer', t.shipment?.customerName ?? (t.lot.customerName || '—')],
    ['Shipped', t.shipment ? `${t.shipment.shippedOn} (${t.shipment.number})` : 'not shipped'],
    ['Reworks', String(t.unit.reworkCount)],
  ]
  const cellW = WIDTH / 4
  fields.forEach(([name, text], i) => {
    const x = PAGE.margin + (i % 4) * cellW
    const y = c.y + Math.floor(i / 4) * 9 * MM
    drawLine(doc, name, x, y, small)
    drawLine(doc, text, x, y + 3 * MM, strong, { width: cellW - 2 * MM })
  })
  c.y += 19 * MM
}

function stepRun(c: Cursor, r: TraceStepRunDto) {
  c.room(16 * MM)
  const tag = r.result === 'pass' ? 'PASS' : 'FAIL'
  c.row([
    [`${r.stepPosition}. ${r.stepName}${r.isRework ? ' (rework)' : ''}`, 0.34, strong],
    [`attempt ${r.attempt} · ${tag}`, 0.18, strong],
    [`${r.stationCode} ${r.stationName}`, 0.22],
    [r.operator + (r.countersignedBy ? `, signed off by ${r.countersignedBy}` : ''), 0.26],
  ])
  c.row([[`Started ${when(r.startedAt)}, finished ${when(r.finishedAt)}`, 1, small]])
  if (HV_KINDS.has(r.stationKind)) c.row([[HIGH_VOLTAGE_CAUTION, 1, small]])
  if (r.values.length) {
    c.head([
      ['Check', 0.38],
      ['Value', 0.2],
      ['Limits', 0.26],
      ['Result', 0.16],
    ])
    for (const v of r.values)
      c.row([
        [`${v.label}${v.isDerived ? ' (derived)' : ''}`, 0.38],
        [traceValueText(v), 0.2, strong],
        [traceLimitText(v), 0.26],
        [v.isPass ? 'pass' : 'FAIL', 0.16, v.isPass ? body : strong],
      ])
  }
  if (r.note) c.row([[`Note: ${r.note}`, 1, small]])
  c.y += 2 * MM
}

function sections(c: Cursor, t: UnitTraceDto) {
  c.heading(`Step runs (${t.stepRuns.length})`)
  if (!t.stepRuns.length) c.text('No step has been run on this unit yet.')
  for (const r of t.stepRuns) stepRun(c, r)

  c.heading(`Component lots fitted (${t.consumptions.length})`)
  if (!t.consumptions.length) c.text('No component lot was recorded for this unit.')
  else
    c.head([
      ['Part', 0.3],
      ['Internal lot', 0.16],
      ['Supplier and lot', 0.3],
      ['Qty', 0.08],
      ['Certificate', 0.16],
    ])
  for (const k of t.consumptions)
    c.row([
      [`${k.partNumber} ${k.partDescription}${k.itemSerial ? ` · item ${k.itemSerial}` : ''}`, 0.3],
      [k.internalCode, 0.16, strong],
      [`${k.supplierName} · ${k.supplierLotCode}`, 0.3],
      [`${k.quantity} ${k.unitOfMeasure}`, 0.08],
      [k.certificateFilename ?? 'none filed', 0.16],
    ])

  c.heading(`Nonconformances (${t.nonconformances.length})`)
  if (!t.nonconformances.length) c.text('None.')
  for (const n of t.nonconformances) {
    const disposition = n.disposition
      ? `${n.disposition.replace(/_/g, ' ')}${n.reworkToStepName ? ` back to ${n.reworkToStepName}` : ''} · decided by ${n.decidedBy ?? '—'} on ${when(n.closedAt)}`
      : 'awaiting a decision'
    c.row([
      [`${n.stepName} · ${n.defectCode ?? 'no defect code'}`, 0.34, strong],
      [`${n.defectDescription ?? ''}${n.description ? ` — ${n.description}` : ''}`, 0.3],
      [disposition + (n.reason ? ` (${n.reason})` : ''), 0.36],
    ])
  }

  c.heading('Shipment')
  if (!t.shipment) c.text('Not shipped.')
  else {
    const s = t.shipment
    c.text(
      `${s.number} to ${s.customerName} on ${s.shippedOn} · order ${s.orderRef || '—'} · ${s.carrier || 'carrier not given'} ${s.tracking}`,
    )
  }

  c.heading(`Service cases (${t.serviceCases.length})`)
  if (!t.serviceCases.length) c.text('None.')
  for (const s of t.serviceCases)
    c.row([
      [`${s.number} · ${s.status} · received ${s.receivedOn}`, 0.3, strong],
      [s.complaint + (s.findings ? ` — findings: ${s.findings}` : ''), 0.45],
      [s.resolution ? s.resolution.replace(/_/g, ' ') : 'open', 0.25],
    ])

  c.heading(`Documents (${t.documents.length})`)
  for (const d of t.documents)
    c.row([
      [DOCUMENT_KIND_LABELS[d.kind], 0.3],
      [d.filename, 0.5],
      [when(d.createdAt), 0.2, small],
    ])
}

function footers(doc: PDFKit.PDFDocument, t: UnitTraceDto) {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    const y = PAGE.height - PAGE.footer + 3 * MM
    drawText(doc, HIGH_VOLTAGE_CAUTION, PAGE.margin, y, small, { width: WIDTH, lineBreak: true })
    drawLine(
      doc,
      `${t.unit.serial} · made ${when(t.generatedAt)} from the Waymark record · page ${i + 1} of ${range.count}`,
      PAGE.margin,
      PAGE.height - 7 * MM,
      small,
      { width: WIDTH },
    )
  }
}

/** The unit history record: everything Trace shows, on A4, with the high-voltage caution. */
export async function unitHistoryPdf(t: UnitTraceDto): Promise<Buffer> {
  const doc = newPdf({
    bufferPages: true,
    info: { Title: `Unit history record ${t.unit.serial}`, Author: 'Waymark' },
  })
  registerGreekFonts(doc)
  doc.addPage({ size: 'A4', margin: 0 })
  const c = new Cursor(doc)
  header(c, t)
  sections(c, t)
  footers(doc, t)
  return pdfBuffer(doc)
}
