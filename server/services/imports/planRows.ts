import { cellBoolean, cellNumber } from '../../../shared/imports'
import type { ImportMapping } from '../../../shared/imports'
import { codeFromScan } from '../../../shared/links'
import { judgeStepRun } from '../../../shared/floor/decideStepRun'
import { routeRefusal } from '../../../shared/floor/routeRules'
import { typedValueProblem } from '../../../shared/floor/typedValues'
import type { TypedValueProblem } from '../../../shared/floor/typedValues'
import type { CheckValue } from '../../../shared/recipes/evaluate'
import type { ImportRowCheckDto } from '../../../shared/schemas/imports'
import type { CheckDto } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { ImportRow, Lot, Station, StepRun, Unit } from '../../models'
import { findUnitByScan, stepPlan } from '../floor'
import type { StepPlan } from '../floor'
import type { BenchTable } from './benchCsv'
import { importRowEventId } from './importIds'
import { CHUNK } from './loadImport'

// The dry run's reading of a file: for each row, what the import would record and every reason
// it cannot. Reads only; the dry run's job (dryRun.ts) stores what this returns.

/** An import row as the dry run plans it; the import job fills in the outcome later. */
export type RowPlan = Omit<
  ImportRow['_creationAttributes'],
  'outcome' | 'outcomeMessage' | 'stepRunId'
>

/** A cell read as its check's kind: a number or yes/no when it reads as one, else the text. */
function cellValue(check: CheckDto, cell: string): CheckValue {
  switch (check.kind) {
    case 'numeric':
      return cellNumber(cell) ?? cell
    case 'boolean':
      return cellBoolean(cell) ?? cell
    case 'text':
      return cell.slice(0, 2000)
    case 'choice':
      return cell
  }
}

/** A bench cell's problem in the import's words, which quote the cell. */
function cellWords(check: CheckDto, cell: string, problem: TypedValueProblem): string {
  const what =
    problem === 'not_number'
      ? 'not a number'
      : problem === 'not_yes_no'
        ? 'not yes or no'
        : problem === 'not_a_choice'
          ? `not one of ${check.choices?.map((o) => o.value).join(', ')}`
          : 'not a value'
  return `${check.label}: "${cell}" is ${what}`
}

/** A cell as the value its check expects, or the words saying why it is not. */
function typedValue(check: CheckDto, cell: string): { value: CheckValue } | { error: string } {
  const value = cellValue(check, cell)
  // The same validator the scan refuses a submission with (shared/floor/typedValues.ts).
  const problem = typedValueProblem(check, value)
  return problem ? { error: cellWords(check, cell, problem) } : { value }
}

async function unitsBySerial(serials: string[]): Promise<Map<string, Unit>> {
  const out = new Map<string, Unit>()
  const unique = [...new Set(serials.filter(Boolean))]
  for (let i = 0; i < unique.length; i += CHUNK) {
    const units = await Unit.findAll({ where: { serial: unique.slice(i, i + CHUNK) } })
    for (const u of units) out.set(u.serial, u)
  }
  return out
}

async function usedEventIds(ids: string[]): Promise<Set<string>> {
  const out = new Set<string>()
  for (let i = 0; i < ids.length; i += CHUNK) {
    const runs = await StepRun.findAll({
      where: { clientEventId: ids.slice(i, i + CHUNK) },
      attributes: ['clientEventId'],
    })
    for (const r of runs) out.add(r.clientEventId)
  }
  return out
}

/** Why a serial matches no unit, in the words the Floor uses (mistyped or unknown). */
async function unknownSerialWords(serial: string): Promise<string> {
  try {
    await findUnitByScan(serial)
    return `${serial} is not a unit here`
  } catch (err) {
    if (err instanceof AppError) return err.message
    throw err
  }
}

/**
 * Works out, for every row of the table, what the import would record and every reason it
 * cannot: no or unknown serial, a unit not due at this station (the Floor's own route rules),
 * a step the import cannot do alone (countersign, parts to fit), a missing or non-numeric value,
 * the same serial twice in the file, a row already imported. Route rules, the typed-value check
 * and the verdicts are the scan's own (shared/floor/). Pure reads: nothing is written.
 */
export async function planRows(
  table: BenchTable,
  mapping: ImportMapping,
  station: Station,
  sha256: string,
  importId: string,
  /** Told how many rows are planned, about fifty times over the table. */
  onPlanned: (done: number, total: number) => Promise<void> = async () => {},
): Promise<RowPlan[]> {
  const col = new Map(table.columns.map((c, i) => [c, i]))
  const cell = (row: string[], column: string | null) =>
    column === null ? '' : (row[col.get(column) ?? -1] ?? '').trim()
  const serials = table.rows.map((r) => codeFromScan(cell(r, mapping.serialColumn)))
  const units = await unitsBySerial(serials)
  const eventIds = table.rows.map((_, i) => importRowEventId(sha256, i + 2))
  const used = await usedEventIds(eventIds)
  const lots = new Map<string, Lot>()
  const lotIds = [...new Set([...units.values()].map((u) => u.lotId))]
  for (let i = 0; i < lotIds.length; i += CHUNK)
    for (const l of await Lot.findAll({ where: { id: lotIds.slice(i, i + CHUNK) } }))
      lots.set(l.id, l)
  const plans = new Map<string, StepPlan | null>()
  const unknownWords = new Map<string, string>()
  const firstRowOf = new Map<string, number>()
  const out: RowPlan[] = []
  const every = Math.max(1, Math.floor(table.rows.length / 50))
  for (const [i, row] of table.rows.entries()) {
    if (i > 0 && i % every === 0) await onPlanned(i, table.rows.length)
    const rowNumber = i + 2
    const serial = serials[i]!
    const errors: string[] = []
    const plan: RowPlan = {
      importId,
      rowNumber,
      clientEventId: eventIds[i]!,
      serial: serial.slice(0, 200),
      unitId: null,
      stepId: null,
      stepName: null,
      benchTime: cell(row, mapping.timeColumn).slice(0, 100) || null,
      benchOperator: cell(row, mapping.operatorColumn).slice(0, 100) || null,
      values: {},
      checks: [],
      result: null,
      errors,
    }
    out.push(plan)
    if (used.has(plan.clientEventId))
      errors.push('already imported: this row of this file was recorded before')
    if (!serial) {
      errors.push(`no serial in column "${mapping.serialColumn}"`)
      continue
    }
    const first = firstRowOf.get(serial)
    if (first !== undefined)
      errors.push(
        `duplicate: ${serial} is also on row ${first}; only one row per unit is imported from a file`,
      )
    else firstRowOf.set(serial, rowNumber)
    const unit = units.get(serial)
    if (!unit) {
      if (!unknownWords.has(serial)) unknownWords.set(serial, await unknownSerialWords(serial))
      errors.push(unknownWords.get(serial)!)
      continue
    }
    plan.unitId = unit.id
    const stepId = unit.currentStepId
    if (stepId && !plans.has(stepId)) plans.set(stepId, await stepPlan(stepId))
    const step = stepId ? (plans.get(stepId) ?? null) : null
    const refusal = routeRefusal(unit, lots.get(unit.lotId)!, step, station)
    if (refusal) errors.push(refusal.message)
    if (!step || refusal) continue
    plan.stepId = step.id
    plan.stepName = step.name
    if (step.requiresSignoff)
      errors.push(`${step.name} needs a second person’s countersign; record it at the Floor`)
    if (step.bomLines.length)
      errors.push(
        `${step.name} fits parts (${step.bomLines.length} line(s)); record it at the Floor`,
      )
    const values: Record<string, CheckValue> = {}
    const cells: Record<string, string> = {}
    for (const check of step.checks.filter((c) => !c.derived)) {
      const column = mapping.checkColumns[check.key]
      if (!column) {
        errors.push(`${check.label}: no column is mapped to this check`)
        continue
      }
      const text = cell(row, column)
      cells[check.key] = text
      if (!text) {
        errors.push(`${check.label}: no value in column "${column}"`)
        continue
      }
      const typed = typedValue(check, text)
      if ('error' in typed) errors.push(typed.error)
      else values[check.key] = typed.value
    }
    // Judged as the scan judges it: the same function, the same overall verdict.
    const { results, result } = judgeStepRun(step, values)
    plan.values = values
    plan.checks = step.checks.map((c): ImportRowCheckDto => ({
      key: c.key,
      label: c.label,
      unit: c.unit,
      cell: c.derived ? null : (cells[c.key] ?? null),
      value: results[c.key]!.value,
      lower: c.lower,
      upper: c.upper,
      verdict: results[c.key]!.verdict,
      isDerived: results[c.key]!.isDerived,
    }))
    plan.result = result
  }
  return out
}
