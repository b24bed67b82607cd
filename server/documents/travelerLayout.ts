import type { CheckDto, StepDto } from '../../shared/schemas/recipes'
import { HIGH_VOLTAGE_KINDS } from '../../shared/stations'
import { checkLimitWords } from '../../shared/recipes/limitText'
import { FONT, MM } from './pdf'
import { textHeight } from './pdfText'
import type { TextStyle } from './pdfText'

/** A4 portrait geometry of a traveler page, in points. */
export const PAGE = {
  width: 210 * MM,
  height: 297 * MM,
  margin: 12 * MM,
  tableTop: 58 * MM,
  tableHeadHeight: 6 * MM,
  footerTop: 278 * MM,
}

/** The route table's columns, left to right, in points; together they span the page margins. */
const widths = { pos: 9, step: 38, label: 47, limits: 38, reading: 20, sign: 34 }
export const COL = (() => {
  let x = PAGE.margin
  const out = {} as Record<keyof typeof widths, { x: number; w: number }>
  for (const [key, mm] of Object.entries(widths) as [keyof typeof widths, number][]) {
    out[key] = { x, w: mm * MM }
    x += mm * MM
  }
  return out
})()
export const TABLE_WIDTH = PAGE.width - 2 * PAGE.margin

export const STYLE = {
  position: { font: FONT.bold, size: 14 },
  stepName: { font: FONT.medium, size: 10 },
  stepMeta: { font: FONT.regular, size: 8, color: '#444444' },
  checkLabel: { font: FONT.regular, size: 9 },
  checkLimits: { font: FONT.medium, size: 9 },
  note: { font: FONT.regular, size: 8 },
  caution: { font: FONT.medium, size: 8 },
  boxLabel: { font: FONT.regular, size: 6.5, color: '#555555' },
} satisfies Record<string, TextStyle>

export const ROW = {
  padY: 1.8 * MM,
  cellPad: 1.5 * MM,
  readingBox: 6.5 * MM,
  checkGap: 1.2 * MM,
  signBox: 13 * MM,
  signGap: 1.5 * MM,
  cautionPad: 1.6 * MM,
  cautionTag: 24 * MM,
}

/** One step, or a share of its checks when the step alone is taller than a page. */
export interface RowPiece {
  step: StepDto
  checks: CheckDto[]
  isFirst: boolean
  isLast: boolean
  height: number
}

export const isHighVoltage = (step: StepDto) => HIGH_VOLTAGE_KINDS.includes(step.stationKind)

/** Inner widths of the text areas of a row. */
export const AREA = {
  step: COL.step.w - 2 * ROW.cellPad,
  label: COL.label.w - 2 * ROW.cellPad,
  limits: COL.limits.w - 2 * ROW.cellPad,
  note: COL.label.w + COL.limits.w + COL.reading.w - 2 * ROW.cellPad,
  caution: TABLE_WIDTH - 2 * ROW.cellPad - ROW.cautionTag - 2 * ROW.cautionPad,
}

export const stepMeta = (step: StepDto, isFirst: boolean, kindLabel: string) =>
  [isFirst ? kindLabel : `${kindLabel}, continued`, step.requiresSignoff ? 'two-person' : '']
    .filter(Boolean)
    .join(' · ')

/** Height of one check line: the taller of its label, its limits and the reading box. */
export function checkLineHeight(doc: PDFKit.PDFDocument, check: CheckDto): number {
  const label = textHeight(doc, check.label, STYLE.checkLabel, AREA.label)
  const limits = textHeight(doc, checkLimitWords(check), STYLE.checkLimits, AREA.limits)
  return Math.max(label, limits, ROW.readingBox) + ROW.checkGap
}

export const safetyText = (step: StepDto) => `Safety: ${step.safetyNote.trim()}`

export function cautionHeight(doc: PDFKit.PDFDocument, caution: string): number {
  const text = textHeight(doc, caution, STYLE.caution, AREA.caution)
  return Math.max(text, 5 * MM) + 2 * ROW.cautionPad
}

/** Height of a row piece, top rule to bottom rule. */
export function pieceHeight(
  doc: PDFKit.PDFDocument,
  piece: Omit<RowPiece, 'height'>,
  caution: string,
  kindLabel: string,
): number {
  const { step, checks, isFirst, isLast } = piece
  const left =
    textHeight(doc, step.name, STYLE.stepName, AREA.step) +
    textHeight(doc, stepMeta(step, isFirst, kindLabel), STYLE.stepMeta, AREA.step)
  let middle = checks.length
    ? checks.reduce((sum, c) => sum + checkLineHeight(doc, c), 0)
    : ROW.readingBox + ROW.checkGap
  if (isFirst && step.safetyNote.trim())
    middle += textHeight(doc, safetyText(step), STYLE.note, AREA.note) + ROW.checkGap
  const boxes = step.requiresSignoff ? 2 : 1
  const sign = isLast ? boxes * ROW.signBox + (boxes - 1) * ROW.signGap : 0
  const band = isHighVoltage(step) ? cautionHeight(doc, caution) + ROW.padY : 0
  return 2 * ROW.padY + Math.max(left, middle, sign) + band
}

/**
 * Splits a route into pages of row pieces. A step moves whole to the next page when it does not
 * fit; only a step taller than a whole page is cut between its checks.
 */
export function paginate(
  doc: PDFKit.PDFDocument,
  steps: StepDto[],
  caution: string,
  kindLabel: (step: StepDto) => string,
): RowPiece[][] {
  const available = PAGE.footerTop - 2 * MM - PAGE.tableTop - PAGE.tableHeadHeight
  const pages: RowPiece[][] = [[]]
  let room = available
  const measure = (p: Omit<RowPiece, 'height'>) => pieceHeight(doc, p, caution, kindLabel(p.step))
  const place = (p: Omit<RowPiece, 'height'>, height: number) => {
    pages[pages.length - 1]!.push({ ...p, height })
    room -= height
  }
  const newPage = () => {
    pages.push([])
    room = available
  }
  for (const step of steps) {
    const whole = { step, checks: step.checks, isFirst: true, isLast: true }
    const height = measure(whole)
    if (height > room && height <= available && pages[pages.length - 1]!.length) newPage()
    if (height <= room) {
      place(whole, height)
      continue
    }
    let start = 0
    while (start < step.checks.length || start === 0) {
      let count = step.checks.length - start
      const piece = (n: number) => ({
        step,
        checks: step.checks.slice(start, start + n),
        isFirst: start === 0,
        isLast: start + n >= step.checks.length,
      })
      while (count > 1 && measure(piece(count)) > room) count--
      if (measure(piece(count)) > room && pages[pages.length - 1]!.length) {
        newPage()
        continue
      }
      place(piece(count), measure(piece(count)))
      start += Math.max(count, 1)
    }
  }
  return pages
}
