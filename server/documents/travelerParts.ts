import type { CheckDto } from '../../shared/schemas/recipes'
import { checkLimitWords } from '../../shared/recipes/limitText'
import { FONT, MM } from './pdf'
import { drawLine, drawText, textHeight } from './pdfText'
import type { TextStyle } from './pdfText'
import {
  AREA,
  COL,
  PAGE,
  ROW,
  STYLE,
  TABLE_WIDTH,
  cautionHeight,
  checkLineHeight,
  isHighVoltage,
  safetyText,
  stepMeta,
} from './travelerLayout'
import type { RowPiece } from './travelerLayout'

const INK = '#000000'
const RULE = '#777777'
const SHADE = '#e6e6e6'

function rule(doc: PDFKit.PDFDocument, y: number, width = 0.6, color = RULE): void {
  doc
    .moveTo(PAGE.margin, y)
    .lineTo(PAGE.margin + TABLE_WIDTH, y)
    .lineWidth(width)
    .strokeColor(color)
    .stroke()
}

/** The shaded row of column titles above the route table. */
export function drawTableHead(doc: PDFKit.PDFDocument): void {
  const y = PAGE.tableTop
  doc.rect(PAGE.margin, y, TABLE_WIDTH, PAGE.tableHeadHeight).fillColor(SHADE).fill()
  const head: TextStyle = { font: FONT.bold, size: 8, color: INK }
  const titles: [keyof typeof COL, string][] = [
    ['pos', 'Step'],
    ['step', 'Operation · station'],
    ['label', 'Check'],
    ['limits', 'Pass when'],
    ['reading', 'Reading'],
    ['sign', 'Signed off'],
  ]
  for (const [col, title] of titles)
    drawLine(doc, title, COL[col].x + ROW.cellPad, y + 1.6 * MM, head, {
      width: COL[col].w - 2 * ROW.cellPad,
    })
}

function drawCheck(doc: PDFKit.PDFDocument, check: CheckDto, y: number): void {
  drawText(doc, check.label, COL.label.x + ROW.cellPad, y + 1 * MM, STYLE.checkLabel, {
    width: AREA.label,
  })
  drawText(doc, checkLimitWords(check), COL.limits.x + ROW.cellPad, y + 1 * MM, STYLE.checkLimits, {
    width: AREA.limits,
  })
  const boxX = COL.reading.x + ROW.cellPad
  const boxW = COL.reading.w - 2 * ROW.cellPad
  if (check.derived) {
    // Derived values come from other readings: nothing to write, so no box to tempt anyone.
    drawLine(doc, 'computed', boxX, y + 1.4 * MM, STYLE.stepMeta, { width: boxW })
    return
  }
  // A tick needs a square; a reading needs room for the digits.
  const width = check.kind === 'boolean' ? ROW.readingBox : boxW
  doc.rect(boxX, y, width, ROW.readingBox).lineWidth(0.8).strokeColor(INK).stroke()
  if (check.kind === 'numeric' && check.unit)
    drawLine(doc, check.unit, boxX, y + ROW.readingBox - 3.2 * MM, STYLE.boxLabel, {
      width: boxW - 1 * MM,
      align: 'right',
    })
}

function drawSignBoxes(doc: PDFKit.PDFDocument, piece: RowPiece, top: number): void {
  const x = COL.sign.x + ROW.cellPad
  const w = COL.sign.w - 2 * ROW.cellPad
  const labels = ['Operator: signature, date']
  if (piece.step.requiresSignoff) labels.push('Second person: signature, date')
  labels.forEach((label, i) => {
    const y = top + i * (ROW.signBox + ROW.signGap)
    doc.rect(x, y, w, ROW.signBox).lineWidth(0.8).strokeColor(INK).stroke()
    drawLine(doc, label, x + 1 * MM, y + 0.8 * MM, STYLE.boxLabel, { width: w - 2 * MM })
  })
}

function drawCaution(doc: PDFKit.PDFDocument, caution: string, y: number): void {
  const x = PAGE.margin + ROW.cellPad
  const w = TABLE_WIDTH - 2 * ROW.cellPad
  const h = cautionHeight(doc, caution)
  doc.rect(x, y, w, h).fillColor('#f4f4f4').fill()
  doc.rect(x, y, w, h).lineWidth(1.6).strokeColor(INK).stroke()
  doc.rect(x, y, ROW.cautionTag, h).fillColor(INK).fill()
  const tag: TextStyle = { font: FONT.bold, size: 9, color: '#ffffff' }
  drawLine(doc, 'HIGH VOLTAGE', x, y + h / 2 - 4.5, tag, { width: ROW.cautionTag, align: 'center' })
  const textY = y + (h - textHeight(doc, caution, STYLE.caution, AREA.caution)) / 2
  drawText(doc, caution, x + ROW.cautionTag + ROW.cautionPad, textY, STYLE.caution, {
    width: AREA.caution,
  })
}

/** One route-table row: step, checks with limits and reading boxes, sign-off, caution band. */
export function drawPiece(
  doc: PDFKit.PDFDocument,
  piece: RowPiece,
  top: number,
  kindLabel: string,
  caution: string,
): void {
  const { step } = piece
  const y = top + ROW.padY
  drawLine(doc, String(step.position), COL.pos.x + ROW.cellPad, y - 0.6 * MM, STYLE.position)
  const nameX = COL.step.x + ROW.cellPad
  drawText(doc, step.name, nameX, y, STYLE.stepName, { width: AREA.step })
  const nameH = textHeight(doc, step.name, STYLE.stepName, AREA.step)
  drawText(doc, stepMeta(step, piece.isFirst, kindLabel), nameX, y + nameH, STYLE.stepMeta, {
    width: AREA.step,
  })
  let checkY = y
  for (const check of piece.checks) {
    drawCheck(doc, check, checkY)
    checkY += checkLineHeight(doc, check)
  }
  if (!piece.checks.length) {
    const none = piece.isLast ? 'No readings: sign off when done.' : ''
    drawLine(doc, none, COL.label.x + ROW.cellPad, checkY + 1 * MM, STYLE.stepMeta)
    checkY += ROW.readingBox + ROW.checkGap
  }
  if (piece.isFirst && step.safetyNote.trim())
    drawText(doc, safetyText(step), COL.label.x + ROW.cellPad, checkY, STYLE.note, {
      width: AREA.note,
    })
  if (piece.isLast) drawSignBoxes(doc, piece, y)
  if (isHighVoltage(step))
    drawCaution(doc, caution, top + piece.height - ROW.padY - cautionHeight(doc, caution))
  rule(doc, top + piece.height)
}
