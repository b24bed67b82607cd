import type { CheckSeriesDto } from '../../shared/schemas/statistics'
import { CAPABILITY_CONFIDENCE } from '../../shared/quality/spcSeries'
import { drawLine, drawText, textHeight } from './pdfText'
import { BAR, CONTENT, Cursor, heading, INK, M, MUTED, num, RULE, S, WARN } from './lotReportLayout'

// The lot report's section per key check (issue 20 point 4): the individuals and moving-range
// chart in scan order with its limits, the specification limits, the run-rule hits and Cp/Cpk
// with their intervals. The figures come from shared/quality/spcSeries.ts through the data.

const LIMIT = '#8a6d1c'

interface Line {
  value: number
  label: string
  color: string
  dashed: boolean
}

/** One chart of points in a box, with labelled horizontal lines; returns its bottom. */
function drawChart(
  doc: PDFKit.PDFDocument,
  box: { x: number; y: number; w: number; h: number },
  values: readonly (number | null)[],
  lines: Line[],
  flagged: ReadonlySet<number>,
  decimals: number,
): void {
  const shown = values.filter((v): v is number => v !== null)
  const all = [...shown, ...lines.map((l) => l.value)]
  const lo = Math.min(...all)
  const hi = Math.max(...all)
  const pad = (hi - lo || Math.abs(hi) || 1) * 0.08
  const yOf = (v: number) => box.y + box.h - ((v - (lo - pad)) / (hi - lo + 2 * pad)) * box.h
  const xOf = (i: number) =>
    box.x + (values.length === 1 ? box.w / 2 : (i / (values.length - 1)) * box.w)
  doc.rect(box.x, box.y, box.w, box.h).lineWidth(0.4).strokeColor(RULE).stroke()
  for (const l of lines) {
    doc.moveTo(box.x, yOf(l.value)).lineTo(box.x + box.w, yOf(l.value))
    if (l.dashed) doc.dash(3, { space: 2 })
    doc.lineWidth(0.7).strokeColor(l.color).stroke()
    if (l.dashed) doc.undash()
    drawLine(doc, `${l.label} ${num(l.value, decimals)}`, box.x + box.w + 3, yOf(l.value) - 3.5, {
      ...S.small,
      color: l.color,
    })
  }
  let started = false
  values.forEach((v, i) => {
    if (v === null) return
    if (started) doc.lineTo(xOf(i), yOf(v))
    else doc.moveTo(xOf(i), yOf(v))
    started = true
  })
  doc.lineWidth(0.6).strokeColor(BAR).stroke()
  values.forEach((v, i) => {
    if (v === null) return
    const isFlagged = flagged.has(i)
    doc
      .circle(xOf(i), yOf(v), isFlagged ? 2.6 : 1.5)
      .fillColor(isFlagged ? WARN : BAR)
      .fill()
  })
}

const interval = (i: { low: number; high: number } | null) =>
  i ? ` (${Math.round(CAPABILITY_CONFIDENCE * 100)} % ${num(i.low, 2)} – ${num(i.high, 2)})` : ''

/** The figures of a key check in one sentence. */
export function keyCheckFigures(s: CheckSeriesDto): string {
  const st = s.statistics
  const d = s.check.decimals
  const unit = s.check.unit ? ` ${s.check.unit}` : ''
  const base = `${st.n} readings in scan order · mean ${num(st.capability.mean, d)}${unit}`
  if (st.judgementText) return `${base} · ${st.judgementText}.`
  const rules = new Set(st.violations.map((v) => v.index)).size
  return (
    `${base} · σ within ${num(st.capability.sdWithin, d + 1)} · ` +
    `Cp ${num(st.capability.cp, 2)}${interval(st.cpInterval)} · ` +
    `Cpk ${num(st.capability.cpk, 2)}${interval(st.cpkInterval)} · ` +
    `points meeting a run rule (Western Electric 1–4, red): ${rules} · ` +
    `moving ranges above their limit: ${st.mrAbove.length}.`
  )
}

/** One key check: heading, figures, the individuals chart and the moving-range chart. */
export function drawKeyCheck(doc: PDFKit.PDFDocument, c: Cursor, s: CheckSeriesDto) {
  const { check, statistics: st } = s
  c.need(260)
  heading(
    doc,
    c,
    `Key check · ${check.stepName} · ${check.label}${check.unit ? ` (${check.unit})` : ''}`,
    'individuals and moving-range chart',
  )
  const figures = keyCheckFigures(s)
  drawText(doc, figures, M, c.y, S.body, { width: CONTENT })
  c.y += textHeight(doc, figures, S.body, CONTENT) + 6
  if (st.n === 0) return
  const box = { x: M + 8, w: CONTENT - 80 }
  const spec: Line[] = [
    ...(check.upper === null
      ? []
      : [{ value: check.upper, label: 'USL', color: LIMIT, dashed: false }]),
    ...(check.lower === null
      ? []
      : [{ value: check.lower, label: 'LSL', color: LIMIT, dashed: false }]),
  ]
  const chart = st.chart
  const control: Line[] = chart
    ? [
        { value: chart.ucl, label: 'UCL', color: WARN, dashed: true },
        { value: chart.center, label: 'CL', color: MUTED, dashed: false },
        { value: chart.lcl, label: 'LCL', color: WARN, dashed: true },
      ]
    : []
  const values = s.points.map((p) => p.value)
  const ruleHits = new Set(st.violations.map((v) => v.index))
  drawChart(doc, { ...box, y: c.y, h: 90 }, values, [...spec, ...control], ruleHits, check.decimals)
  c.y += 96
  if (chart) {
    drawLine(doc, 'moving range', M + 8, c.y, S.small)
    c.y += 10
    drawChart(
      doc,
      { ...box, y: c.y, h: 44 },
      [null, ...st.movingRanges],
      [
        { value: chart.mrUcl, label: 'UCL', color: WARN, dashed: true },
        { value: chart.mrCenter, label: 'MR̄', color: MUTED, dashed: false },
      ],
      new Set(st.mrAbove),
      check.decimals,
    )
    c.y += 50
  }
  const note = `scan order, left to right${s.isCut ? ' (latest readings only)' : ''}`
  drawLine(doc, note, box.x, c.y, { ...S.small, color: INK }, { width: box.w, align: 'center' })
  c.y += 16
}
