import ExcelJS from 'exceljs'
import type { ExportFormat } from '../../../shared/schemas/exports'
import type { CheckDto } from '../../../shared/schemas/recipes'
import type { YieldSummaryQuery } from '../../../shared/schemas/yield'
import { AppError } from '../../errors'
import { Lot } from '../../models'
import { safeText, writeCsv } from '../../csv'
import { toRevisionDto } from '../recipes'
import { loadRevision } from '../recipes'
import { summarizeYield } from '../quality'
import { select } from '../../db/sql'

// Spreadsheet exports: a table of columns (headers carry their units) and rows of plain values,
// written as RFC 4180 CSV (csv-stringify) or as an XLSX workbook (exceljs).

export type CellValue = string | number | Date | null

export interface ExportColumn {
  header: string
  /** How XLSX shows the column; CSV writes numbers as they are and dates as ISO 8601 UTC. */
  format: 'text' | 'integer' | 'datetime' | { decimals: number }
}

export interface ExportTable {
  /** The worksheet's name and the stem of the download's file name. */
  name: string
  filename: string
  columns: ExportColumn[]
  rows: CellValue[][]
}

/** Column header with its unit in brackets, e.g. `Inductance, secondary (mH)`. */
export const withUnit = (label: string, unit: string | null | undefined) =>
  unit ? `${label} (${unit})` : label

/**
 * RFC 4180 CSV: CRLF line ends, fields with a comma, quote or line break quoted, quotes doubled.
 * A UTF-8 byte-order mark first, so that spreadsheet programs read µ and Ω correctly.
 */
export function toCsv(table: ExportTable): Buffer {
  const text = writeCsv([table.columns.map((c) => c.header), ...table.rows])
  return Buffer.from(`\ufeff${text}`, 'utf8')
}

const numFmt = (f: ExportColumn['format']) =>
  f === 'integer'
    ? '0'
    : f === 'datetime'
      ? 'yyyy-mm-dd hh:mm:ss'
      : f === 'text'
        ? '@'
        : f.decimals > 0
          ? `0.${'0'.repeat(f.decimals)}`
          : '0'

/** One worksheet: bold, frozen header row with a filter, number formats per column. */
export async function toXlsx(table: ExportTable): Promise<Buffer> {
  const wb = new ExcelJS.Workbook()
  wb.creator = 'Waymark'
  const ws = wb.addWorksheet(table.name.slice(0, 31).replace(/[\\/?*[\]:]/g, '-'), {
    views: [{ state: 'frozen', ySplit: 1 }],
  })
  ws.columns = table.columns.map((c) => ({
    header: c.header,
    width: Math.min(40, Math.max(10, c.header.length + 2)),
    style: c.format === 'text' ? {} : { numFmt: numFmt(c.format) },
  }))
  const head = ws.getRow(1)
  head.font = { bold: true }
  head.alignment = { vertical: 'middle', wrapText: true }
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: table.columns.length } }
  for (const row of table.rows) ws.addRow(row.map((v) => (typeof v === 'string' ? safeText(v) : v)))
  return Buffer.from(await wb.xlsx.writeBuffer())
}

export const CONTENT_TYPES: Record<ExportFormat, string> = {
  csv: 'text/csv; charset=utf-8; header=present',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
}

/** The file of a table in the asked format. */
export async function renderExport(table: ExportTable, format: ExportFormat): Promise<Buffer> {
  return format === 'csv' ? toCsv(table) : toXlsx(table)
}

const percent = (v: number | null) => (v === null ? null : v * 100)

/** The Yield board's lots table: each lot with FPY, final yield, RTY and WIP. */
export async function lotTableExport(query: YieldSummaryQuery): Promise<ExportTable> {
  const summary = await summarizeYield(query)
  const pct = { decimals: 2 }
  return {
    name: 'Lots',
    filename: `lots-${query.from}-to-${query.to}`,
    columns: [
      { header: 'Lot', format: 'text' },
      { header: 'Product', format: 'text' },
      { header: 'Revision', format: 'text' },
      { header: 'Units started (units)', format: 'integer' },
      { header: 'Units finished (units)', format: 'integer' },
      { header: 'First-pass yield (%)', format: pct },
      { header: 'Final yield (%)', format: pct },
      { header: 'Rolled throughput yield (%)', format: pct },
      { header: 'WIP (units)', format: 'integer' },
    ],
    rows: summary.lots.map((l) => [
      l.number,
      l.productCode,
      l.revisionLetter,
      l.started,
      l.finished,
      percent(l.lotFpy),
      percent(l.finalYield),
      percent(l.rty),
      l.wip,
    ]),
  }
}

interface RunRow {
  id: string
  serial: string
  step_id: string
  step_name: string
  attempt: number
  is_rework: boolean
  station: string
  operator: string
  finished_at: Date
  result: 'pass' | 'fail'
}

interface ValueRow {
  step_run_id: string
  check_id: string
  value_number: number | null
  value_text: string | null
  value_boolean: boolean | null
}

/** Header of each check, unique within the sheet: the step's name is added to a repeated one. */
function checkHeaders(checks: { check: CheckDto; stepName: string }[]): string[] {
  const plain = checks.map(({ check }) => withUnit(check.label, check.unit))
  return plain.map((h, i) =>
    plain.indexOf(h) !== plain.lastIndexOf(h)
      ? withUnit(`${checks[i]!.check.label}, ${checks[i]!.stepName}`, checks[i]!.check.unit)
      : h,
  )
}

/**
 * Every step run of a lot, one row per unit, step and attempt in serial and route order, with
 * a column per check of the route (empty where the run's step does not have that check).
 */
export async function lotMeasurementsExport(lotId: string): Promise<ExportTable> {
  const lot = await Lot.findByPk(lotId, { attributes: ['id', 'number', 'revisionId'] })
  if (!lot) throw AppError.notFound(`lot ${lotId}`)
  const rev = toRevisionDto(await loadRevision(lot.revisionId))
  const checks = rev.steps.flatMap((s) => s.checks.map((check) => ({ check, stepName: s.name })))
  const [runs, values] = await Promise.all([
    select<RunRow>(
      `SELECT sr.id, u.serial, rs.id AS step_id, rs.name AS step_name, sr.attempt, sr.is_rework,
              st.code AS station, us.name AS operator, sr.finished_at, sr.result
         FROM step_runs sr
         JOIN units u ON u.id = sr.unit_id
         JOIN route_steps rs ON rs.id = sr.step_id
         JOIN stations st ON st.id = sr.station_id
         JOIN users us ON us.id = sr.operator_id
        WHERE u.lot_id = :lotId
        ORDER BY u.serial, rs.position, sr.attempt`,
      { replacements: { lotId } },
    ),
    select<ValueRow>(
      `SELECT m.step_run_id, m.check_id, m.value_number, m.value_text, m.value_boolean
         FROM measurements m
         JOIN step_runs sr ON sr.id = m.step_run_id
         JOIN units u ON u.id = sr.unit_id
        WHERE u.lot_id = :lotId`,
      { replacements: { lotId } },
    ),
  ])
  const byRun = new Map<string, Map<string, CellValue>>()
  for (const v of values) {
    const cells = byRun.get(v.step_run_id) ?? new Map<string, CellValue>()
    cells.set(
      v.check_id,
      v.value_number !== null
        ? Number(v.value_number)
        : v.value_boolean !== null
          ? v.value_boolean
            ? 'yes'
            : 'no'
          : v.value_text,
    )
    byRun.set(v.step_run_id, cells)
  }
  const headers = checkHeaders(checks)
  return {
    name: `Lot ${lot.number}`,
    filename: `${lot.number}-measurements`,
    columns: [
      { header: 'Serial', format: 'text' },
      { header: 'Step', format: 'text' },
      { header: 'Attempt (no.)', format: 'integer' },
      { header: 'Rework', format: 'text' },
      { header: 'Station', format: 'text' },
      { header: 'Operator', format: 'text' },
      { header: 'Finished (UTC)', format: 'datetime' },
      { header: 'Result', format: 'text' },
      ...checks.map(({ check }, i) => ({
        header: headers[i]!,
        format: check.kind === 'numeric' ? { decimals: check.decimals } : ('text' as const),
      })),
    ],
    rows: runs.map((r) => {
      const cells = byRun.get(r.id)
      return [
        r.serial,
        r.step_name,
        r.attempt,
        r.is_rework ? 'yes' : 'no',
        r.station,
        r.operator,
        new Date(r.finished_at),
        r.result,
        ...checks.map(({ check }) => cells?.get(check.id) ?? null),
      ]
    }),
  }
}
