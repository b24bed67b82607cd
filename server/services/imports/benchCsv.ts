import { parse } from 'csv-parse/sync'
import { fileTypeFromBuffer } from 'file-type'
import { AppError } from '../../errors'

export interface BenchTable {
  columns: string[]
  /** Data rows, cells as text; row i is line i + 2 of a file without quoted line breaks. */
  rows: string[][]
}

const DELIMITERS = [',', ';', '\t'] as const

/** The delimiter a rack used, judged by which one its header line has most of (comma on a tie). */
export function guessDelimiter(text: string): string {
  const header = text.slice(0, text.search(/\r?\n|$/))
  let best: string = ','
  let most = 0
  for (const d of DELIMITERS) {
    const n = header.split(d).length - 1
    if (n > most) {
      best = d
      most = n
    }
  }
  return best
}

/**
 * Whether a buffer is text a rack could have written: not a known binary format (judged by its
 * first bytes, never its name), no NUL bytes, and valid UTF-8. Anything else is a 415.
 */
export async function assertText(body: Buffer): Promise<string> {
  const type = await fileTypeFromBuffer(body)
  if (type)
    throw AppError.unsupportedType(
      `file: the content is ${type.mime}; send the rack's CSV file (text)`,
    )
  if (body.includes(0))
    throw AppError.unsupportedType('file: the content is binary; send the rack’s CSV file (text)')
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(body)
  } catch {
    throw AppError.unsupportedType(
      'file: the content is not UTF-8 text; save the file as CSV (UTF-8) and send it again',
    )
  }
}

/**
 * Parses a bench CSV with csv-parse: the first row names the columns, each later row is one
 * unit's run. Column names must be present and distinct; a malformed file is a 400 naming the
 * line csv-parse stopped at.
 */
export function parseBenchCsv(text: string): BenchTable {
  let records: string[][]
  try {
    records = parse(text, {
      bom: true,
      delimiter: guessDelimiter(text.replace(/^\uFEFF/, '')),
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
    }) as string[][]
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err)
    throw AppError.badRequest(`file: this is not a readable CSV file (${message})`, {
      file: 'not a readable CSV file',
    })
  }
  const [header, ...rows] = records
  if (!header || header.length < 2)
    throw AppError.badRequest('file: the first line must name at least two columns', {
      file: 'no header line',
    })
  const blank = header.findIndex((c) => c === '')
  if (blank >= 0)
    throw AppError.badRequest(`file: column ${blank + 1} of the first line has no name`, {
      file: 'a column without a name',
    })
  const seen = new Set<string>()
  for (const c of header) {
    if (seen.has(c))
      throw AppError.badRequest(`file: two columns are named "${c}"`, { file: 'repeated column' })
    seen.add(c)
  }
  if (!rows.length)
    throw AppError.badRequest('file: the file has a header line but no rows', { file: 'no rows' })
  return { columns: header, rows }
}
