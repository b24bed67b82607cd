import { MEDIAN_MIN_RUNS, MEDIAN_SUSPECT_TURNS } from '../../shared/quality/turnReview'
import type { TurnSeries } from './lotReportTypes'
import { drawLine, drawText, textHeight } from './pdfText'
import {
  BAR,
  CONTENT,
  Cursor,
  heading,
  INK,
  M,
  nothingToShow,
  MUTED,
  num,
  RULE,
  S,
  table,
  WARN,
} from './lotReportLayout'

// The lot report's turn-deviation section: per winding and signal, a histogram and an
// individuals chart of the deviations, the suspected miscounts and a table by bench and operator.

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

/** One turn-deviation series: the board's verdict, its charts, summary and bench table. */
export function drawTurnSeries(doc: PDFKit.PDFDocument, c: Cursor, s: TurnSeries) {
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
    return nothingToShow(doc, c, none)
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
