import type { CheckDto } from './schemas/recipes'

/** Where a bench file is on its way from upload to recorded step runs. */
export const IMPORT_STATUSES = [
  'uploaded',
  'checking',
  'checked',
  'queued',
  'running',
  'done',
  'failed',
] as const
export type ImportStatus = (typeof IMPORT_STATUSES)[number]

/** What became of one good row when the import ran. */
export const IMPORT_ROW_OUTCOMES = ['recorded', 'repeat', 'refused'] as const
export type ImportRowOutcome = (typeof IMPORT_ROW_OUTCOMES)[number]

export const IMPORT_STATUS_WORDS: Record<ImportStatus, string> = {
  uploaded: 'Uploaded, not checked',
  checking: 'Checking rows',
  checked: 'Checked, ready to import',
  queued: 'Waiting for the import job',
  running: 'Importing',
  done: 'Imported',
  failed: 'Import stopped',
}

export const IMPORT_OUTCOME_WORDS: Record<ImportRowOutcome, string> = {
  recorded: 'Recorded',
  repeat: 'Already recorded',
  refused: 'Refused',
}

/** Largest bench file accepted, in bytes. */
export const IMPORT_MAX_BYTES = 20 * 1024 * 1024

/** A station's saved column mapping: which column holds the serial, the time, each check. */
export interface ImportMapping {
  serialColumn: string
  timeColumn: string | null
  operatorColumn: string | null
  /** Check key → column name. A check left out has no column. */
  checkColumns: Record<string, string>
}

/** Lower case, letters and digits only: "Vout (V)" and "vout_v" compare equal. */
export function squash(s: string): string {
  return s.toLowerCase().replace(/[^a-z0-9]/g, '')
}

const SERIAL_WORDS = [
  'serial',
  'serialnumber',
  'sn',
  'serialno',
  'unit',
  'unitserial',
  'dut',
  'uut',
]
const TIME_WORDS = ['time', 'timestamp', 'datetime', 'date', 'testedat', 'start', 'started']
const OPERATOR_WORDS = ['operator', 'user', 'tester', 'testedby', 'tech', 'technician']

function firstMatching(columns: readonly string[], words: readonly string[]): string | null {
  const exact = columns.find((c) => words.includes(squash(c)))
  if (exact) return exact
  return columns.find((c) => words.some((w) => w.length > 3 && squash(c).includes(w))) ?? null
}

type MappableCheck = Pick<CheckDto, 'key' | 'label' | 'unit'>

/**
 * How well a column name fits a check: 3 for its key, 2 for its label, 2 for "label (unit)" or
 * "key_unit", 1 when the key or label appears inside the name; 0 when nothing fits.
 */
export function columnFit(column: string, check: MappableCheck): number {
  const c = squash(column)
  const key = squash(check.key)
  const label = squash(check.label)
  const unit = check.unit ? squash(check.unit) : ''
  if (c === key) return 3
  if (c === label) return 2
  if (unit && (c === key + unit || c === label + unit)) return 2
  if ((key.length >= 2 && c.includes(key)) || (label.length >= 3 && c.includes(label))) return 1
  return 0
}

/**
 * A first guess at a mapping from the file's column names: the serial, time and operator
 * columns by their usual names, and each check by its key, label and unit. Each column is
 * used once, the best fits first; the person adjusts the rest on the screen.
 */
export function proposeMapping(
  columns: readonly string[],
  checks: readonly MappableCheck[],
): ImportMapping {
  const serialColumn = firstMatching(columns, SERIAL_WORDS) ?? columns[0] ?? ''
  const rest = columns.filter((c) => c !== serialColumn)
  const timeColumn = firstMatching(rest, TIME_WORDS)
  const operatorColumn = firstMatching(
    rest.filter((c) => c !== timeColumn),
    OPERATOR_WORDS,
  )
  const taken = new Set([serialColumn, timeColumn, operatorColumn].filter(Boolean) as string[])
  const pairs: { key: string; column: string; fit: number }[] = []
  for (const check of checks)
    for (const column of columns) {
      const fit = columnFit(column, check)
      if (fit > 0 && !taken.has(column)) pairs.push({ key: check.key, column, fit })
    }
  pairs.sort((a, b) => b.fit - a.fit)
  const checkColumns: Record<string, string> = {}
  for (const p of pairs) {
    if (p.key in checkColumns || taken.has(p.column)) continue
    checkColumns[p.key] = p.column
    taken.add(p.column)
  }
  return { serialColumn, timeColumn, operatorColumn, checkColumns }
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/

/** A bench cell as a number: plain decimal with a point, optional exponent; else null. */
export function cellNumber(cell: string): number | null {
  const t = cell.trim()
  if (!NUMBER.test(t)) return null
  const n = Number(t)
  return Number.isFinite(n) ? n : null
}

const YES = ['yes', 'y', 'true', '1', 'pass', 'ok']
const NO = ['no', 'n', 'false', '0', 'fail', 'nok']

/** A bench cell as yes or no (yes/no, true/false, 1/0, pass/fail); else null. */
export function cellBoolean(cell: string): boolean | null {
  const t = cell.trim().toLowerCase()
  if (YES.includes(t)) return true
  if (NO.includes(t)) return false
  return null
}
