import type { LotReportData } from './lotReportTypes'
import { drawLine } from './pdfText'
import {
  BAR,
  CONTENT,
  CUMULATIVE,
  Cursor,
  heading,
  INK,
  M,
  nothingToShow,
  pct,
  RULE,
  S,
  WHISKER,
} from './lotReportLayout'

// The lot report's bar charts: first-pass yield per step and the defect-code Pareto.

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

/** Bars of each step's first-pass yield with whiskers of its 95 % Wilson interval. */
export function drawStepFpy(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
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

/** Nonconformances per defect code, most first, with the cumulative share as a line. */
export function drawPareto(doc: PDFKit.PDFDocument, c: Cursor, d: LotReportData) {
  heading(doc, c, 'Why units failed', 'nonconformances per defect code, with the cumulative share')
  if (!d.pareto.length) return nothingToShow(doc, c, 'No nonconformances in this lot.')
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
