import { FONT, newPdf, pdfBuffer } from './pdf'
import { fixedPdfInfo } from './pdfInfo'
import { drawLine, drawText, registerGreekFonts } from './pdfText'
import { drawPareto, drawStepFpy } from './lotReportCharts'
import {
  CONTENT,
  Cursor,
  day,
  FOOTER_TOP,
  heading,
  M,
  minute,
  nothingToShow,
  num,
  pct,
  pctRange,
  rule,
  S,
  table,
} from './lotReportLayout'
import { drawKeyCheck } from './lotReportKeyChecks'
import { drawTurnSeries } from './lotReportTurns'
import type { LotReportData } from './lotReportTypes'

// The lot report: one A4 PDF with a lot's yield figures and their intervals, vector charts of
// step FPY, defect Pareto and turn deviation, check capability and the nonconformances.
// The page layout is in lotReportLayout.ts, the bar charts in lotReportCharts.ts and the
// turn-deviation section in lotReportTurns.ts; this file has the tables and puts it together.

export const SAFETY_FOOTER =
  'Hipot and load tests involve lethal voltages. The applicable safety standard, local codes and licensed practice govern; Waymark records results and does not certify a design.'

function drawHeader(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  drawLine(doc, 'LOT REPORT', M, c.y, { ...S.small, font: FONT.medium }, { characterSpacing: 1.2 })
  drawLine(doc, `Figures as of ${minute(d.asOf)}`, M, c.y, S.small, {
    width: CONTENT,
    align: 'right',
  })
  c.y += 12
  drawLine(doc, `Lot ${d.lot.number}`, M, c.y, S.title)
  c.y += 24
  drawLine(
    doc,
    `${d.product.code} rev ${d.revision.letter} · ${d.product.name}`,
    M,
    c.y,
    S.bodyBold,
    { width: CONTENT },
  )
  c.y += 16
  const facts: [string, string][] = [
    ['Quantity', String(d.lot.quantity)],
    ['Status', d.lot.status.replace('_', ' ')],
    ['Order', d.lot.orderRef || '—'],
    ['Customer', d.lot.customerName || 'stock'],
    ['Created', day(d.lot.createdAt)],
    ['Released', day(d.lot.releasedAt)],
    ['Due', day(d.lot.dueDate)],
    ['Closed', day(d.lot.closedAt)],
  ]
  const colW = CONTENT / 4
  facts.forEach(([k, v], i) => {
    const x = M + (i % 4) * colW
    const y = c.y + Math.floor(i / 4) * 24
    drawLine(doc, k, x, y, S.small)
    drawLine(doc, v, x, y + 9, S.body, { width: colW - 6 })
  })
  c.y += 52
}

function drawFigures(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  const y = d.yield
  heading(doc, c, 'Yield', '95 % intervals: Wilson score for yields, exact Poisson for DPU')
  table(
    doc,
    c,
    [
      { title: 'Figure', width: 150 },
      { title: 'Value', width: 70, align: 'right' },
      { title: '95 % interval', width: 100, align: 'right' },
      { title: 'Of', width: CONTENT - 320 },
    ],
    [
      [
        'First-pass yield (lot)',
        pct(y.lotFpy.value),
        y.lotFpy.value === null ? '—' : pctRange(y.lotFpy.interval),
        `${y.finished} finished units; clean at every step`,
      ],
      [
        'Final yield',
        pct(y.finalYield.value),
        y.finalYield.value === null ? '—' : pctRange(y.finalYield.interval),
        `${y.passed} passed of ${y.finished} finished`,
      ],
      [
        'Rolled throughput yield',
        pct(y.rty),
        '—',
        'product of the step FPYs; no interval for a product',
      ],
      [
        'Defects per unit',
        num(d.dpu.value, 3),
        d.dpu.value === null
          ? '—'
          : `${num(d.dpu.interval.low, 3)} – ${num(d.dpu.interval.high, 3)}`,
        `${d.dpu.defects} failed step runs over ${y.started} units started`,
      ],
    ],
  )
  const wip = y.wip.reduce((n, w) => n + w.units, 0)
  drawLine(
    doc,
    `Units: ${y.started} started · ${y.finished} finished · ${y.passed} passed · ${y.scrapped} scrapped · ${wip} still on the route`,
    M,
    c.y,
    S.smallInk,
    { width: CONTENT },
  )
  c.y += 14
}

function drawCapability(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(
    doc,
    c,
    'Capability of the numeric checks',
    'Cp, Cpk: within σ (moving range / 1.128) · Pp, Ppk: overall σ',
  )
  if (!d.capability.length) return nothingToShow(doc, c, 'No numeric readings yet.')
  table(
    doc,
    c,
    [
      { title: 'Step', width: 62 },
      { title: 'Check', width: 128 },
      { title: 'LSL', width: 44, align: 'right' },
      { title: 'USL', width: 44, align: 'right' },
      { title: 'n', width: 30, align: 'right' },
      { title: 'Mean', width: 52, align: 'right' },
      { title: 'Cp', width: 36, align: 'right' },
      { title: 'Cpk', width: 36, align: 'right' },
      { title: 'Pp', width: 36, align: 'right' },
      { title: 'Ppk', width: 36, align: 'right' },
    ],
    d.capability.map((k) => [
      k.stepName,
      k.unit ? `${k.label} (${k.unit})` : k.label,
      num(k.lower, k.decimals),
      num(k.upper, k.decimals),
      String(k.n),
      num(k.mean, k.decimals + 1),
      num(k.cp),
      num(k.cpk),
      num(k.pp),
      num(k.ppk),
    ]),
  )
}

const DISPOSITION_WORDS = { rework: 'rework', scrap: 'scrap', use_as_is: 'use as is' } as const

function drawNonconformances(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(doc, c, 'Nonconformances', `${d.nonconformances.length} in this lot`)
  if (!d.nonconformances.length) return nothingToShow(doc, c, 'None.')
  table(
    doc,
    c,
    [
      { title: 'Serial', width: 88 },
      { title: 'Step', width: 62 },
      { title: 'Defect code', width: 60 },
      { title: 'Disposition', width: 78 },
      { title: 'Decided by', width: 84 },
      { title: 'Opened', width: 56 },
      { title: 'Reason', width: CONTENT - 428 },
    ],
    d.nonconformances.map((n) => [
      n.serial,
      n.stepName,
      n.defectCode ?? '—',
      n.disposition
        ? DISPOSITION_WORDS[n.disposition] +
          (n.disposition === 'rework' && n.reworkToStepName ? ` to ${n.reworkToStepName}` : '')
        : 'open',
      n.decidedBy ? n.decidedBy + (n.countersignedBy ? ` / ${n.countersignedBy}` : '') : '—',
      day(n.openedAt),
      n.reason || n.description || '',
    ]),
  )
}

function drawFooters(doc: PDFKit.PDFDocument, d: LotReportData) {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    rule(doc, FOOTER_TOP)
    drawText(doc, SAFETY_FOOTER, M, FOOTER_TOP + 4, S.small, { width: CONTENT, lineBreak: true })
    const where = `${d.product.code} rev ${d.revision.letter} · lot ${d.lot.number} · lot report`
    drawLine(doc, where, M, FOOTER_TOP + 22, { ...S.small, font: FONT.medium })
    drawLine(doc, `Page ${i + 1} of ${range.count}`, M, FOOTER_TOP + 22, S.small, {
      width: CONTENT,
      align: 'right',
    })
  }
}

/**
 * The lot report as one A4 PDF. Deterministic for the same data (the info dates are the
 * figures' as-of time), so a job that runs twice stores the same file.
 * @param onProgress awaited after each section with the share done, ending at 1
 */
export async function lotReportPdf(
  data: LotReportData,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<Buffer> {
  const doc = newPdf({
    size: 'A4',
    margin: 0,
    bufferPages: true,
    info: fixedPdfInfo(`Lot report, lot ${data.lot.number}`, data.asOf),
  })
  registerGreekFonts(doc)
  const c = new Cursor(doc)
  c.newPage()
  const sections: ((doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) => void)[] = [
    drawHeader,
    drawFigures,
    drawStepFpy,
    drawPareto,
    (doc, c, d) => {
      for (const s of d.turnSeries) drawTurnSeries(doc, c, s)
    },
    drawCapability,
    (doc, c, d) => {
      for (const s of d.keyChecks) drawKeyCheck(doc, c, s)
    },
    drawNonconformances,
  ]
  for (const [i, draw] of sections.entries()) {
    draw(doc, c, data)
    await onProgress?.((i + 1) / (sections.length + 1))
  }
  drawFooters(doc, data)
  await onProgress?.(1)
  return pdfBuffer(doc)
}
