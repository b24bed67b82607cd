import { createRequire } from 'node:module'
import { FONT } from './pdf'

const require = createRequire(import.meta.url)
const greekFile = (weight: number) =>
  require.resolve(`@fontsource/roboto-condensed/files/roboto-condensed-greek-${weight}-normal.woff`)

export type FontName = (typeof FONT)[keyof typeof FONT]

// The Latin subset of Roboto Condensed has µ and ° but no Ω, which resistance checks use
// (insulation resistance in MΩ at hipot). Greek runs are set in the Greek subset instead.
const GREEK: Record<FontName, string> = {
  [FONT.regular]: 'BodyGreek',
  [FONT.medium]: 'BodyGreekMedium',
  [FONT.bold]: 'BodyGreekBold',
}

/** Registers the Greek companions of FONT on a document made by newPdf(). */
export function registerGreekFonts(doc: PDFKit.PDFDocument): void {
  doc.registerFont(GREEK[FONT.regular], greekFile(400))
  doc.registerFont(GREEK[FONT.medium], greekFile(500))
  doc.registerFont(GREEK[FONT.bold], greekFile(700))
}

/** Text split into runs of Greek and non-Greek characters (the ohm sign counts as omega). */
export function scriptRuns(text: string): { text: string; isGreek: boolean }[] {
  const runs: { text: string; isGreek: boolean }[] = []
  for (const ch of text.replace(/\u2126/g, '\u03a9')) {
    const code = ch.codePointAt(0)!
    const isGreek = code >= 0x0370 && code <= 0x03ff
    const last = runs[runs.length - 1]
    if (last && last.isGreek === isGreek) last.text += ch
    else runs.push({ text: ch, isGreek })
  }
  return runs
}

export interface TextStyle {
  font: FontName
  size: number
  color?: string
}

type TextOptions = PDFKit.Mixins.TextOptions

/** Height of `text` set in `style` within `width`; Greek letters are close enough in width. */
export function textHeight(
  doc: PDFKit.PDFDocument,
  text: string,
  style: TextStyle,
  width: number,
  options: TextOptions = {},
): number {
  return doc
    .font(style.font)
    .fontSize(style.size)
    .heightOfString(text, { width, ...options })
}

/** Width of one line of `text` set in `style`. */
export function textWidth(doc: PDFKit.PDFDocument, text: string, style: TextStyle): number {
  return doc.font(style.font).fontSize(style.size).widthOfString(text)
}

/** Draws `text` at (x, y), switching to the Greek subset for Greek runs. */
export function drawText(
  doc: PDFKit.PDFDocument,
  text: string,
  x: number,
  y: number,
  style: TextStyle,
  options: TextOptions = {},
): void {
  doc.fillColor(style.color ?? '#000000').fontSize(style.size)
  const runs = scriptRuns(text)
  if (runs.length <= 1) {
    doc.font(style.font).text(text, x, y, options)
    return
  }
  runs.forEach((run, i) => {
    doc.font(run.isGreek ? GREEK[style.font] : style.font)
    const more = i < runs.length - 1
    if (i === 0) doc.text(run.text, x, y, { ...options, continued: more })
    else doc.text(run.text, { continued: more })
  })
}

/** `text` cut with an ellipsis so that it fits `width` on one line in `style`. */
export function fitLine(
  doc: PDFKit.PDFDocument,
  text: string,
  style: TextStyle,
  width: number,
): string {
  if (textWidth(doc, text, style) <= width) return text
  let cut = text
  while (cut.length > 1 && textWidth(doc, `${cut}…`, style) > width) cut = cut.slice(0, -1)
  return `${cut.trimEnd()}…`
}

/**
 * Draws one line that never wraps: cut to `width` when given, aligned within it, with each
 * script run placed by hand (pdfkit aligns continued runs one by one, so they would overlap).
 */
export function drawLine(
  doc: PDFKit.PDFDocument,
  text: string,
  x: number,
  y: number,
  style: TextStyle,
  options: { width?: number; align?: 'left' | 'center' | 'right'; characterSpacing?: number } = {},
): void {
  const line = options.width === undefined ? text : fitLine(doc, text, style, options.width)
  const runs = scriptRuns(line).map((run) => {
    const font = run.isGreek ? GREEK[style.font] : style.font
    doc.font(font).fontSize(style.size)
    const spacing = options.characterSpacing ?? 0
    return { ...run, font, width: doc.widthOfString(run.text, { characterSpacing: spacing }) }
  })
  const total = runs.reduce((sum, run) => sum + run.width, 0)
  const free = options.width === undefined ? 0 : Math.max(0, options.width - total)
  let cursor = x + (options.align === 'right' ? free : options.align === 'center' ? free / 2 : 0)
  doc.fillColor(style.color ?? '#000000')
  for (const run of runs) {
    doc.font(run.font).fontSize(style.size)
    doc.text(run.text, cursor, y, {
      lineBreak: false,
      characterSpacing: options.characterSpacing ?? 0,
    })
    cursor += run.width
  }
}
