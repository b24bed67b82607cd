import { stringify } from 'csv-stringify/sync'

/** A cell of a CSV file as the app has it: text, a number, a time or nothing. */
export type CsvValue = string | number | Date | null | undefined

/**
 * Text that a spreadsheet would read as a formula (=, +, -, @, tab, CR at the start) gets a
 * leading apostrophe, the usual defence against formula injection through exported data
 * (OWASP "CSV Injection"). Only text: numbers are never touched, so -3.5 stays a number.
 */
export function safeText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text
}

/** One cell: text guarded, numbers as they are, times as ISO 8601 UTC, nothing as empty. */
export function csvCell(v: CsvValue): string | number {
  if (v === null || v === undefined) return ''
  if (v instanceof Date) return v.toISOString()
  return typeof v === 'string' ? safeText(v) : v
}

/**
 * The one CSV writer of the app (csv-stringify): every record's cells go through `csvCell`, so no
 * text cell reaches a spreadsheet as a formula. Fields with a comma, quote, line break or
 * leading/trailing space are quoted and quotes doubled (RFC 4180); `windows` ends records with
 * CRLF as RFC 4180 says, `unix` with LF.
 */
export function writeCsv(
  records: readonly (readonly CsvValue[])[],
  recordDelimiter: 'windows' | 'unix' = 'windows',
): string {
  return stringify(
    records.map((r) => r.map(csvCell)),
    { record_delimiter: recordDelimiter, quoted_match: /^\s|\s$/ },
  )
}
