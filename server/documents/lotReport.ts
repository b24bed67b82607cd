import { MEDIAN_MIN_RUNS, MEDIAN_SUSPECT_TURNS } from '../../shared/quality/turnReview'
import type { LotReportData, TurnSeries } from '../services/documents'
import { FONT, MM, newPdf, pdfBuffer } from './pdf'
import { fixedPdfInfo } from './pdfInfo'
import { drawLine, drawText, registerGreekFonts, textHeight } from './pdfText'
import type { TextStyle } from './pdfText'

// The lot report: one A4 PDF with a lot's yield figures and their intervals, vector charts of
// step FPY, defect Pareto and turn deviation, check capability and the nonconformances.

const W = 595.28
const H = 841.89
const M = 16 * MM
const CONTENT = W - 2 * M
const FOOTER_TOP = H - 16 * MM
const BOTTOM = FOOTER_TOP - 4 * MM

const INK = '#1d2b36'
const MUTED = '#5f6b73'
const RULE = '#b9c2c8'
const BAR = '#2f6f8f'
const WHISKER = '#0f2a3a'
const WARN = '#b23a2e'
const CUMULATIVE = '#c47f17'

const S = {
  title: { font: FONT.bold, size: 18, color: INK },
  h2: { font: FONT.bold, size: 11.5, color: INK },
  body: { font: FONT.regular, size: 9, color: INK },
  bodyBold: { font: FONT.medium, size: 9, color: INK },
  small: { font: FONT.regular, size: 7.5, color: MUTED },
  smallInk: { font: FONT.regular, size: 7.5, color: INK },
  tableHead: { font: FONT.medium, size: 7.5, color: MUTED },
  cell: { font: FONT.regular, size: 8, color: INK },
} satisfies Record<string, TextStyle>

export const SAFETY_FOOTER =
  'Hipot and load tests involve lethal voltages. The applicable safety standard, local codes and licensed practice govern; Waymark records results and does not certify a design.'

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

const day = (d: Date | string | null) =>
  d === null ? '—' : (typeof d === 'string' ? d : d.toISOString()).slice(0, 10)
const minute = (d: Date | null) =>
  d === null ? '—' : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`

class Cursor {
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

function heading(doc: PDFKit.PDFDocument, c: Cursor, text: string, note = '') {
  c.need(40)
  c.y += 4
  drawLine(doc, text, M, c.y, S.h2)
  if (note) drawLine(doc, note, M, c.y + 3, S.small, { width: CONTENT, align: 'right' })
  c.y += 16
  doc
    .moveTo(M, c.y)
    .lineTo(W - M, c.y)
    .lineWidth(0.5)
    .strokeColor(RULE)
    .stroke()
  c.y += 6
}

interface Column {
  title: string
  width: number
  align?: 'left' | 'right'
}

/** A table that continues on the next page, repeating its head, with rows of one line. */
function table(doc: PDFKit.PDFDocument, c: Cursor, cols: Column[], rows: string[][]) {
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
    doc
      .moveTo(M, c.y - 3)
      .lineTo(W - M, c.y - 3)
      .lineWidth(0.4)
      .strokeColor(RULE)
      .stroke()
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

/** Axis ticks 0–100 % on a vertical scale; returns the y of a fraction. */
function percentAxis(doc: PDFKit.PDFDocument, x: number, top: number, h: number, w: number) {
  const yOf = (f: number) => top + h - f * h
  for (const f of [0, 0.25, 0.5, 0.75, 1]) {
    doc
      .moveTo(x, yOf(f))
      .lineTo(x + w, yOf(f))
      .lineWidth(f === 0 ? 0.6 : 0.3)
      .strokeColor(f === 0 ? INK : RULE)
      .stroke()
    drawLine(doc, `${f * 100} %`, x - 30, yOf(f) - 3.5, S.small, { width: 26, align: 'right' })
  }
  return yOf
}

function drawStepFpy(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(doc, c, 'First-pass yield per step', 'bars: FPY · whiskers: 95 % Wilson interval')
  const h = 120
  c.need(h + 40)
  const x0 = M + 34
  const w = CONTENT - 34
  const top = c.y + 4
  const yOf = percentAxis(doc, x0, top, h, w)
  const steps = d.yield.steps
  const slot = w / Math.max(1, steps.length)
  const barW = Math.min(46, slot * 0.55)
  steps.forEach((s, i) => {
    const cx = x0 + slot * (i + 0.5)
    if (s.fpy !== null) {
      doc
        .rect(cx - barW / 2, yOf(s.fpy), barW, yOf(0) - yOf(s.fpy))
        .fillColor(BAR)
        .fill()
      const lo = yOf(s.interval.low)
      const hi = yOf(s.interval.high)
      doc
        .moveTo(cx, lo)
        .lineTo(cx, hi)
        .moveTo(cx - 6, lo)
        .lineTo(cx + 6, lo)
        .moveTo(cx - 6, hi)
        .lineTo(cx + 6, hi)
        .lineWidth(1)
        .strokeColor(WHISKER)
        .stroke()
    }
    const label = s.fpy === null ? 'no runs' : pct(s.fpy)
    drawLine(doc, label, cx - slot / 2, top + h + 4, S.bodyBold, { width: slot, align: 'center' })
    drawLine(doc, s.name, cx - slot / 2, top + h + 15, S.small, { width: slot, align: 'center' })
    drawLine(doc, `${s.passedFirst}/${s.firstAttempts}`, cx - slot / 2, top + h + 24, S.small, {
      width: slot,
      align: 'center',
    })
  })
  c.y = top + h + 40
}

function drawPareto(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(doc, c, 'Why units failed', 'nonconformances per defect code, with the cumulative share')
  if (!d.pareto.length) {
    drawLine(doc, 'No nonconformances in this lot.', M, c.y, S.body)
    c.y += 16
    return
  }
  const h = 110
  c.need(h + 36)
  const x0 = M + 34
  const w = CONTENT - 70
  const top = c.y + 4
  const total = d.pareto.reduce((n, b) => n + b.count, 0)
  const max = d.pareto[0]!.count
  const yCount = (n: number) => top + h - (n / max) * h
  // Left axis: the cumulative share; each bar carries its count on top.
  percentAxis(doc, x0, top, h, w)
  const slot = w / d.pareto.length
  const barW = Math.min(44, slot * 0.6)
  let cum = 0
  const points: [number, number][] = []
  d.pareto.forEach((b, i) => {
    const cx = x0 + slot * (i + 0.5)
    doc
      .rect(cx - barW / 2, yCount(b.count), barW, top + h - yCount(b.count))
      .fillColor(BAR)
      .fill()
    drawLine(doc, String(b.count), cx - slot / 2, yCount(b.count) - 10, S.bodyBold, {
      width: slot,
      align: 'center',
    })
    drawLine(doc, b.code, cx - slot / 2, top + h + 4, S.bodyBold, { width: slot, align: 'center' })
    drawLine(doc, b.description, cx - slot / 2, top + h + 14, S.small, {
      width: slot,
      align: 'center',
    })
    cum += b.count
    points.push([cx, top + h - (cum / total) * h])
  })
  doc.moveTo(points[0]![0], points[0]![1])
  for (const [x, y] of points.slice(1)) doc.lineTo(x, y)
  doc.lineWidth(1.2).strokeColor(CUMULATIVE).stroke()
  for (const [x, y] of points) doc.circle(x, y, 2.2).fillColor(CUMULATIVE).fill()
  drawLine(doc, 'cumulative', x0 + w + 4, top - 2, { ...S.small, color: CUMULATIVE })
  drawLine(doc, `${max} max`, x0 + w + 4, top + 8, S.small)
  c.y = top + h + 30
}

/** A step of 1, 2 or 5 × 10ⁿ near `raw`. */
function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw))
  const m = raw / p
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p
}

/** "+1.2 %", "−0.4 %"; no sign on what rounds to zero. */
function signedPercent(v: number): string {
  const text = num(Math.abs(v), 1)
  return `${Number(text) === 0 ? '' : v > 0 ? '+' : '−'}${text} %`
}

function drawTurnSeries(doc: PDFKit.PDFDocument, c: Cursor, s: TurnSeries) {
  const method =
    s.method === 'ratio'
      ? 'from the voltage-ratio test (precise)'
      : 'from inductance against the lot’s median core (a lot-wide AL offset cancels)'
  c.need(300) // heading, charts and the summary stay together
  heading(doc, c, `Turn deviation · ${s.winding}, ${s.nominalTurns} turns nominal`, method)
  if (s.verdict) {
    // The Yield board's sentence for this winding, word for word.
    drawText(doc, s.verdict.summary, M, c.y, S.body, { width: CONTENT })
    c.y += textHeight(doc, s.verdict.summary, S.body, CONTENT) + 6
  }
  if (s.points.length === 0) {
    const none =
      s.method === 'median'
        ? `No chart yet: the lot’s median needs ${MEDIAN_MIN_RUNS} inductance readings or more.`
        : 'No readings yet.'
    drawLine(doc, none, M, c.y, S.body)
    c.y += 16
    return
  }
  const dev = s.points.map((p) => p.deviation)
  const lo = Math.min(0, ...dev, s.chart?.lcl ?? 0)
  const hi = Math.max(0, ...dev, s.chart?.ucl ?? 0)
  const step = niceStep(Math.max((hi - lo) / 12, 0.05))
  const start = Math.floor(lo / step) * step
  const bins = Math.max(1, Math.ceil((hi - start) / step + 1e-9))
  const counts = new Array<number>(bins).fill(0)
  for (const v of dev) counts[Math.min(bins - 1, Math.floor((v - start) / step + 1e-9))]! += 1

  const h = 100
  c.need(h + 150)
  const top = c.y + 4
  // Histogram, left third.
  const hx = M + 18
  const hw = CONTENT * 0.32
  const maxCount = Math.max(...counts)
  const binW = hw / bins
  counts.forEach((n, i) => {
    const bh = (n / maxCount) * h
    doc
      .rect(hx + i * binW + 0.5, top + h - bh, binW - 1, bh)
      .fillColor(BAR)
      .fill()
  })
  doc
    .moveTo(hx, top + h)
    .lineTo(hx + hw, top + h)
    .lineWidth(0.6)
    .strokeColor(INK)
    .stroke()
  const xOfDev = (v: number) => hx + ((v - start) / (bins * step)) * hw
  doc
    .moveTo(xOfDev(0), top)
    .lineTo(xOfDev(0), top + h)
    .dash(2, { space: 2 })
    .lineWidth(0.6)
    .strokeColor(MUTED)
    .stroke()
    .undash()
  drawLine(doc, num(start, 2), hx - 10, top + h + 3, S.small)
  drawLine(doc, num(start + bins * step, 2), hx + hw - 20, top + h + 3, S.small, {
    width: 30,
    align: 'right',
  })
  drawLine(doc, `deviation, turns (bins of ${num(step, 2)})`, hx, top + h + 13, S.small, {
    width: hw,
    align: 'center',
  })
  drawLine(doc, `${maxCount}`, hx - 16, top - 3, S.small)

  // Individuals chart, right two thirds.
  const ix = M + CONTENT * 0.42
  const iw = CONTENT * 0.58 - 24
  const chart = s.chart
  const ymin = Math.min(...dev, chart?.lcl ?? Infinity)
  const ymax = Math.max(...dev, chart?.ucl ?? -Infinity)
  const pad = (ymax - ymin || 1) * 0.08
  const yOf = (v: number) => top + h - ((v - (ymin - pad)) / (ymax - ymin + 2 * pad)) * h
  const xOf = (i: number) => ix + (dev.length === 1 ? iw / 2 : (i / (dev.length - 1)) * iw)
  doc.rect(ix, top, iw, h).lineWidth(0.4).strokeColor(RULE).stroke()
  const hasSpread =
    chart !== null && chart.ucl !== null && chart.lcl !== null && chart.ucl > chart.lcl
  if (chart) {
    const line = (v: number, label: string, dashed: boolean) => {
      doc.moveTo(ix, yOf(v)).lineTo(ix + iw, yOf(v))
      if (dashed) doc.dash(3, { space: 2 })
      doc
        .lineWidth(0.7)
        .strokeColor(dashed ? WARN : MUTED)
        .stroke()
      if (dashed) doc.undash()
      drawLine(doc, `${label} ${num(v, 2)}`, ix + iw + 2, yOf(v) - 3.5, S.small)
    }
    if (hasSpread) line(chart.ucl!, 'UCL', true)
    line(chart.center, 'CL', false)
    if (hasSpread) line(chart.lcl!, 'LCL', true)
    else drawLine(doc, 'no spread: no limits', ix + 4, top + 4, S.small)
  }
  doc.moveTo(xOf(0), yOf(dev[0]!))
  dev.forEach((v, i) => i > 0 && doc.lineTo(xOf(i), yOf(v)))
  doc.lineWidth(0.6).strokeColor(BAR).stroke()
  const flagged = new Map<number, number[]>()
  for (const v of s.violations) flagged.set(v.index, [...(flagged.get(v.index) ?? []), v.rule])
  dev.forEach((v, i) => {
    const rules = flagged.get(i)
    doc
      .circle(xOf(i), yOf(v), rules ? 2.6 : 1.5)
      .fillColor(rules ? WARN : BAR)
      .fill()
  })
  // Label each run of flagged points once, at its first point, with the rules it met.
  let last = -2
  for (const [i, rules] of [...flagged.entries()].sort((a, b) => a[0] - b[0])) {
    if (i > last + 1)
      drawLine(doc, `R${[...new Set(rules)].join(',')}`, xOf(i) - 6, yOf(dev[i]!) - 11, {
        ...S.small,
        color: WARN,
      })
    last = i
  }
  drawLine(doc, `build order, left to right (${dev.length} readings)`, ix, top + h + 3, S.small, {
    width: iw,
    align: 'center',
  })
  c.y = top + h + 28

  const miscounts = s.points.filter((p) => p.miscount)
  const ruleCount = new Set(s.violations.map((v) => v.index)).size
  const against =
    s.method === 'ratio'
      ? 'estimate rounds to another whole turn than the nominal'
      : `${num(MEDIAN_SUSPECT_TURNS, 1)} turns or more off what the lot’s median inductance implies`
  const offset =
    s.lotOffsetPercent === null
      ? ''
      : ` The lot’s median inductance is ${signedPercent(s.lotOffsetPercent)} from AL·N².`
  const summary =
    `Suspected miscounts (${against}): ${miscounts.length}` +
    (miscounts.length ? ` — ${miscounts.map((p) => p.serial).join(', ')}` : '') +
    `. Points meeting a run rule (Western Electric 1–4, marked red): ${ruleCount}.` +
    offset
  drawText(doc, summary, M, c.y, S.smallInk, { width: CONTENT })
  c.y += textHeight(doc, summary, S.smallInk, CONTENT) + 6
  // By bench and operator, so a drifting bench stands out.
  const groups = new Map<string, { n: number; sum: number; miscounts: number }>()
  for (const p of s.points) {
    const key = `${p.station} · ${p.operator}`
    const g = groups.get(key) ?? { n: 0, sum: 0, miscounts: 0 }
    g.n += 1
    g.sum += p.deviation
    g.miscounts += p.miscount ? 1 : 0
    groups.set(key, g)
  }
  table(
    doc,
    c,
    [
      { title: 'Bench · operator', width: 200 },
      { title: 'Readings', width: 70, align: 'right' },
      { title: 'Mean deviation (turns)', width: 110, align: 'right' },
      { title: 'Suspected miscounts', width: 100, align: 'right' },
    ],
    [...groups.entries()]
      .sort((a, b) => a[0].localeCompare(b[0]))
      .map(([k, g]) => [k, String(g.n), num(g.sum / g.n, 2), String(g.miscounts)]),
  )
}

function drawCapability(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(
    doc,
    c,
    'Capability of the numeric checks',
    'Cp, Cpk: within σ (moving range / 1.128) · Pp, Ppk: overall σ',
  )
  if (!d.capability.length) {
    drawLine(doc, 'No numeric readings yet.', M, c.y, S.body)
    c.y += 16
    return
  }
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
  if (!d.nonconformances.length) {
    drawLine(doc, 'None.', M, c.y, S.body)
    c.y += 16
    return
  }
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
    doc
      .moveTo(M, FOOTER_TOP)
      .lineTo(W - M, FOOTER_TOP)
      .lineWidth(0.5)
      .strokeColor(RULE)
      .stroke()
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
