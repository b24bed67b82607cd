import { Op, QueryTypes } from 'sequelize'
import type { Transaction, WhereOptions } from 'sequelize'
import { cellBoolean, cellNumber, IMPORT_MAX_BYTES, proposeMapping } from '../../../shared/imports'
import type { ImportMapping, ImportRowOutcome } from '../../../shared/imports'
import { codeFromScan } from '../../../shared/links'
import { can } from '../../../shared/permissions'
import { judgeStepRun } from '../../../shared/floor/decideStepRun'
import { routeRefusal } from '../../../shared/floor/routeRules'
import { typedValueProblem } from '../../../shared/floor/typedValues'
import type { TypedValueProblem } from '../../../shared/floor/typedValues'
import type { CheckValue } from '../../../shared/recipes/evaluate'
import type {
  ImportCheckDto,
  ImportDto,
  ImportMappingDto,
  ImportMappingInput,
  ImportRowCheckDto,
  ImportRowDto,
  ImportRowsDto,
  ImportRowsQuery,
  ImportRunInput,
} from '../../../shared/schemas/imports'
import { UNIT_STATE_LABELS } from '../../../shared/lots'
import { StepRunInput } from '../../../shared/schemas/lots'
import type { StepRunResultDto } from '../../../shared/schemas/lots'
import type { CheckDto } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { logger } from '../../logger'
import {
  db,
  DefectCode,
  Import,
  ImportMapping as ImportMappingModel,
  ImportRow,
  Lot,
  Station,
  StepRun,
  Unit,
  Upload,
  User,
} from '../../models'
import { getFile, putFile } from '../../storage'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { assertText, parseBenchCsv } from './benchCsv'
import type { BenchTable } from './benchCsv'
import { importRowEventId } from './importIds'
import { stepPlan } from '../floor'
import type { StepPlan } from '../floor'
import { findUnitByScan, recordStepRun } from '../floor'
import { safeFileName } from '../receiving'

const CHUNK = 1000

async function stationByCode(code: string, transaction?: Transaction): Promise<Station> {
  const station = await Station.findOne({ where: { code: code.toUpperCase() }, transaction })
  if (!station) throw AppError.notFound(`station ${code}`)
  return station
}

/** The typed checks of every released step done at stations of this kind, one per key. */
export async function stationChecks(station: Station): Promise<ImportCheckDto[]> {
  const rows = await db().query<{
    key: string
    label: string
    kind: ImportCheckDto['kind']
    unit: ImportCheckDto['unit']
    step: string
  }>(
    `SELECT c.key, c.label, c.kind, c.unit, s.name AS step
       FROM checks c
       JOIN route_steps s ON s.id = c.step_id
       JOIN revisions r ON r.id = s.revision_id
      WHERE s.station_kind = :kind AND r.status <> 'draft' AND c.derived IS NULL
      ORDER BY r.released_at DESC NULLS LAST, s.position, c.position`,
    { replacements: { kind: station.kind }, type: QueryTypes.SELECT },
  )
  const byKey = new Map<string, ImportCheckDto>()
  for (const r of rows) {
    const known = byKey.get(r.key)
    if (known) {
      if (!known.steps.includes(r.step)) known.steps.push(r.step)
    } else
      byKey.set(r.key, { key: r.key, label: r.label, kind: r.kind, unit: r.unit, steps: [r.step] })
  }
  return [...byKey.values()]
}

function toMapping(m: ImportMappingModel): ImportMapping {
  return {
    serialColumn: m.serialColumn,
    timeColumn: m.timeColumn,
    operatorColumn: m.operatorColumn,
    checkColumns: m.checkColumns,
  }
}

// --- column mapping -------------------------------------------------------------------------

export async function getImportMapping(code: string): Promise<ImportMappingDto> {
  const station = await stationByCode(code)
  const saved = await ImportMappingModel.findByPk(station.id)
  return {
    stationCode: station.code,
    stationName: station.name,
    stationKind: station.kind,
    saved: saved ? { ...toMapping(saved), updatedAt: saved.updatedAt.toISOString() } : null,
    checks: await stationChecks(station),
  }
}

/** Saves a station's mapping (one per station, replaced as a whole), audited. */
export async function saveImportMapping(
  code: string,
  input: ImportMappingInput,
  actor: Actor,
): Promise<ImportMappingDto> {
  const station = await stationByCode(code)
  const checks = await stationChecks(station)
  const known = new Set(checks.map((c) => c.key))
  const unknown = Object.keys(input.checkColumns).filter((k) => !known.has(k))
  if (unknown.length)
    throw AppError.badRequest(
      `checkColumns.${unknown[0]}: no released ${station.kind.replace('_', '-')} step has a check "${unknown[0]}"`,
      Object.fromEntries(
        unknown.map((k) => [`checkColumns.${k}`, 'no such check at this station']),
      ),
    )
  await db().transaction(async (transaction) => {
    const before = await ImportMappingModel.findByPk(station.id, {
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    const values = { ...input, updatedBy: actor.id }
    if (before) await before.update(values, { transaction })
    else await ImportMappingModel.create({ stationId: station.id, ...values }, { transaction })
    await recordAudit(
      actor,
      {
        action: 'import_mapping.save',
        entity: 'station',
        entityId: station.id,
        before: before ? toMapping(before) : null,
        after: input,
      },
      transaction,
    )
  })
  return getImportMapping(station.code)
}

// --- upload -----------------------------------------------------------------------------------

async function loadImport(id: string, transaction?: Transaction, lock = false) {
  const imp = await Import.findByPk(id, {
    transaction,
    lock: lock && transaction ? transaction.LOCK.UPDATE : undefined,
  })
  if (!imp) throw AppError.notFound(`import ${id}`)
  return imp
}

export async function toImportDto(imp: Import): Promise<ImportDto> {
  const station = (await Station.findByPk(imp.stationId))!
  const upload = (await Upload.findByPk(imp.uploadId))!
  const saved = await ImportMappingModel.findByPk(imp.stationId)
  const creator = await User.findByPk(imp.createdBy, { attributes: ['name'] })
  const proposed = saved
    ? toMapping(saved)
    : proposeMapping(imp.columns, await stationChecks(station))
  const failing = imp.checkedAt
    ? await ImportRow.count({ where: { ...readyWhere(imp.id), result: 'fail' } })
    : 0
  const same = await Import.findAll({
    where: { sha256: imp.sha256, id: { [Op.ne]: imp.id } },
    order: [['createdAt', 'DESC']],
    limit: 5,
  })
  return {
    id: imp.id,
    stationCode: station.code,
    stationName: station.name,
    stationKind: station.kind,
    filename: imp.filename,
    sha256: imp.sha256,
    size: upload.size,
    columns: imp.columns,
    rowCount: imp.rowCount,
    status: imp.status,
    progress: imp.progress,
    mapping: imp.mapping,
    proposedMapping: proposed,
    hasSavedMapping: saved !== null,
    counts: {
      ready: imp.readyCount,
      errors: imp.errorCount,
      failing,
      recorded: imp.recordedCount,
      skipped: imp.skippedCount,
      refused: imp.failedCount,
    },
    sameFileImports: same.map((s) => ({
      id: s.id,
      createdAt: s.createdAt.toISOString(),
      status: s.status,
    })),
    defectCodeId: imp.defectCodeId,
    error: imp.error,
    createdBy: creator?.name ?? '',
    createdAt: imp.createdAt.toISOString(),
    checkedAt: imp.checkedAt?.toISOString() ?? null,
    finishedAt: imp.finishedAt?.toISOString() ?? null,
  }
}

export async function getImport(id: string): Promise<ImportDto> {
  return toImportDto(await loadImport(id))
}

/** The latest imports, newest first, for the screen's list. */
export async function listImports(): Promise<ImportDto[]> {
  const rows = await Import.findAll({ order: [['createdAt', 'DESC']], limit: 20 })
  return Promise.all(rows.map(toImportDto))
}

/**
 * Takes a rack's CSV: checks it is text (415) of at most 20 MB (413), parses it, stores the file
 * under its sha256 and records the upload and the import, audited. Nothing is checked against
 * units yet; that is the dry run.
 */
export async function uploadBenchFile(
  file: { buffer: Buffer; originalname: string } | undefined,
  stationCode: string,
  actor: Actor,
): Promise<ImportDto> {
  if (!file)
    throw AppError.badRequest('file: attach the CSV file as the form field "file"', {
      file: 'attach a file',
    })
  if (file.buffer.length > IMPORT_MAX_BYTES)
    throw AppError.tooLarge('file: the file is over 20 MB; split the run into smaller files')
  const station = await stationByCode(stationCode)
  const table = parseBenchCsv(await assertText(file.buffer))
  const stored = await putFile('imports', file.buffer, 'text/csv')
  const filename = safeFileName(file.originalname, 'bench.csv')
  const imp = await db().transaction(async (transaction) => {
    const upload = await Upload.create(
      {
        storageKey: stored.key,
        sha256: stored.sha256,
        filename,
        contentType: 'text/csv',
        size: stored.size,
        uploadedBy: actor.id,
      },
      { transaction },
    )
    const created = await Import.create(
      {
        stationId: station.id,
        uploadId: upload.id,
        sha256: stored.sha256,
        filename,
        columns: table.columns,
        rowCount: table.rows.length,
        createdBy: actor.id!,
      },
      { transaction },
    )
    await recordAudit(
      actor,
      {
        action: 'import.upload',
        entity: 'import',
        entityId: created.id,
        after: {
          station: station.code,
          filename,
          sha256: stored.sha256,
          rows: table.rows.length,
        },
      },
      transaction,
    )
    return created
  })
  return toImportDto(imp)
}

// --- dry run ------------------------------------------------------------------------------------

function readyWhere(importId: string): WhereOptions<ImportRow> {
  return {
    importId,
    [Op.and]: [db().where(db().fn('jsonb_array_length', db().col('errors')), 0)],
  } as WhereOptions<ImportRow>
}

type RowPlan = Omit<ImportRow['_creationAttributes'], 'outcome' | 'outcomeMessage' | 'stepRunId'>

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

async function readTable(imp: Import): Promise<BenchTable> {
  const upload = (await Upload.findByPk(imp.uploadId))!
  const file = await getFile(upload.storageKey)
  return parseBenchCsv(await assertText(file.body))
}

/**
 * Asks for the dry run: checks that the station's saved mapping fits the file, then the import
 * goes to `checking` with that mapping, in one transaction with its audit event. The job
 * (checkImport) plans the rows; the caller enqueues it, and the sweeper does if Redis is away.
 */
export async function requestDryRun(id: string, actor: Actor): Promise<Import> {
  return db().transaction(async (transaction) => {
    const imp = await loadImport(id, transaction, true)
    if (imp.status === 'checking')
      throw AppError.conflict('import_checking', 'this file is being checked; wait for the rows')
    if (!['uploaded', 'checked'].includes(imp.status))
      throw AppError.conflict(
        'import_started',
        'this file’s import has already started; upload the file again to check it anew',
      )
    const station = (await Station.findByPk(imp.stationId, { transaction }))!
    const saved = await ImportMappingModel.findByPk(station.id, { transaction })
    if (!saved)
      throw AppError.conflict(
        'no_mapping',
        `save the column mapping of ${station.code} first: which column holds the serial and each check`,
      )
    const mapping = toMapping(saved)
    const missing = [mapping.serialColumn, mapping.timeColumn, mapping.operatorColumn]
      .concat(Object.values(mapping.checkColumns))
      .filter((c): c is string => c !== null && !imp.columns.includes(c))
    if (missing.length)
      throw AppError.badRequest(
        `mapping: this file has no column "${missing[0]}"; adjust the mapping of ${station.code}`,
        { mapping: `no column ${missing[0]}` },
      )
    await imp.update({ status: 'checking', mapping, progress: 0, error: null }, { transaction })
    await recordAudit(
      actor,
      { action: 'import.dry_run', entity: 'import', entityId: id, after: { mapping } },
      transaction,
    )
    return imp
  })
}

/** The share of a dry run's progress bar that planning the rows fills; storing them fills the rest. */
const PLANNED_SHARE = 80

/**
 * Reports a job's progress to its imports row (which the screen polls) and to the job: at most
 * one write every 2 %, never backwards, and below 100 until the caller says it is done.
 */
function progressReporter(imp: Import, onProgress: (percent: number) => Promise<void>) {
  let last = -1
  return async (percent: number) => {
    const rounded = Math.min(99, Math.floor(percent))
    if (rounded < last + 2) return // a write every 2 % is plenty for a progress bar
    last = rounded
    await imp.update({ progress: rounded })
    await onProgress(rounded)
  }
}

/** Rolls a dry run's stored rows back: the import stopped checking while they were written. */
class NoLongerChecking extends Error {}

/**
 * The dry run's job: plans every row with the mapping the request kept and stores the plan
 * (replacing an earlier dry run's), so the import runs exactly what was shown. Writes no step
 * run. Safe to run twice: an import no longer `checking` is left as it is.
 */
export async function checkImport(
  id: string,
  onProgress: (percent: number) => Promise<void> = async () => {},
): Promise<void> {
  const first = await Import.findByPk(id)
  if (first?.status !== 'checking' || !first.mapping) return
  const station = (await Station.findByPk(first.stationId))!
  const report = progressReporter(first, onProgress)
  // Planning the rows is most of the work; storing them the rest.
  const rows = await planRows(
    await readTable(first),
    first.mapping,
    station,
    first.sha256,
    first.id,
    (done, total) => report((done / total) * PLANNED_SHARE),
  )
  await report(PLANNED_SHARE)
  const ready = rows.filter((r) => r.errors.length === 0).length
  const isStored = await db()
    .transaction(async (transaction) => {
      // The import is locked only at the end, so the progress written meanwhile (outside this
      // transaction) never waits for it; a dry run no longer wanted is rolled back then.
      await ImportRow.destroy({ where: { importId: id }, transaction })
      for (let i = 0; i < rows.length; i += CHUNK) {
        await ImportRow.bulkCreate(rows.slice(i, i + CHUNK), { transaction })
        await report(PLANNED_SHARE + ((i + CHUNK) / rows.length) * (100 - PLANNED_SHARE))
      }
      const imp = await loadImport(id, transaction, true)
      if (imp.status !== 'checking') throw new NoLongerChecking()
      await imp.update(
        {
          status: 'checked',
          progress: 0,
          readyCount: ready,
          errorCount: rows.length - ready,
          checkedAt: new Date(),
        },
        { transaction },
      )
      return true
    })
    .catch((err: unknown) => {
      if (err instanceof NoLongerChecking) return false
      throw err
    })
  if (isStored) await onProgress(100)
}

function toRowDto(r: ImportRow): ImportRowDto {
  return {
    rowNumber: r.rowNumber,
    serial: r.serial,
    stepName: r.stepName,
    benchTime: r.benchTime,
    benchOperator: r.benchOperator,
    checks: r.checks,
    result: r.result,
    errors: r.errors,
    outcome: r.outcome,
    outcomeMessage: r.outcomeMessage,
  }
}

/** A page of an import's rows in file order: all, only those with errors, only good ones. */
export async function listImportRows(id: string, q: ImportRowsQuery): Promise<ImportRowsDto> {
  await loadImport(id)
  const errorsLength = db().fn('jsonb_array_length', db().col('errors'))
  const where: WhereOptions<ImportRow> =
    q.show === 'errors'
      ? ({ importId: id, [Op.and]: [db().where(errorsLength, '>', 0)] } as WhereOptions<ImportRow>)
      : q.show === 'ready'
        ? readyWhere(id)
        : q.show === 'refused'
          ? { importId: id, outcome: 'refused' }
          : { importId: id }
  const { rows, count } = await ImportRow.findAndCountAll({
    where,
    order: [['rowNumber', 'ASC']],
    offset: (q.page - 1) * q.pageSize,
    limit: q.pageSize,
  })
  return { rows: rows.map(toRowDto), total: count }
}

// --- the import ---------------------------------------------------------------------------------

/**
 * Asks for the import of a checked file's good rows: the row goes to `queued` in one transaction
 * with its audit event, then the job is enqueued (the sweeper enqueues it if Redis is away).
 */
export async function requestImportRun(
  id: string,
  input: ImportRunInput,
  actor: Actor,
): Promise<Import> {
  return db().transaction(async (transaction) => {
    const imp = await loadImport(id, transaction, true)
    if (imp.status === 'uploaded')
      throw AppError.conflict('not_checked', 'run the dry run first, then import')
    if (imp.status === 'checking')
      throw AppError.conflict('import_checking', 'this file is being checked; wait for the rows')
    if (imp.status !== 'checked')
      throw AppError.conflict(
        'import_started',
        imp.status === 'done'
          ? 'this file was imported already; importing it again records nothing new'
          : 'this file’s import is already under way',
      )
    if (imp.readyCount === 0)
      throw AppError.conflict('nothing_to_import', 'no row of this file can be imported')
    const failing = await ImportRow.count({
      where: { ...readyWhere(id), result: 'fail' },
      transaction,
    })
    if (failing && !input.defectCodeId)
      throw AppError.badRequest(
        `defectCodeId: ${failing} row(s) fail a check; choose the defect code to record with them`,
        { defectCodeId: 'choose a defect code' },
      )
    if (input.defectCodeId && !(await DefectCode.findByPk(input.defectCodeId, { transaction })))
      throw AppError.badRequest('defectCodeId: no such defect code', {
        defectCodeId: 'no such defect code',
      })
    await imp.update(
      { status: 'queued', progress: 0, defectCodeId: failing ? input.defectCodeId : null },
      { transaction },
    )
    await recordAudit(
      actor,
      {
        action: 'import.run',
        entity: 'import',
        entityId: id,
        after: { ready: imp.readyCount, failing, defectCodeId: imp.defectCodeId },
      },
      transaction,
    )
    return imp
  })
}

function stepRunNote(imp: Import, row: ImportRow): string {
  const parts = [`imported from ${imp.filename}, row ${row.rowNumber}`]
  if (row.benchTime) parts.push(`bench time ${row.benchTime}`)
  if (row.benchOperator) parts.push(`bench operator ${row.benchOperator}`)
  return parts.join('; ').slice(0, 2000)
}

/** What a recorded row did to its unit, in the words of the lot page. */
function recordedWords(body: StepRunResultDto): string {
  const { stepRun, unit } = body
  const where =
    stepRun.result === 'pass' && unit.currentStep
      ? `now waits for ${unit.currentStep.name}`
      : `is now ${UNIT_STATE_LABELS[unit.state].toLowerCase()}`
  const nc = body.nonconformanceId ? '; a nonconformance was opened' : ''
  return `${stepRun.result} (attempt ${stepRun.attempt}); ${unit.serial} ${where}${nc}`
}

interface Outcome {
  rowNumber: number
  outcome: ImportRowOutcome
  message: string
  stepRunId: string | null
}

async function writeOutcomes(importId: string, outcomes: Outcome[]): Promise<void> {
  if (!outcomes.length) return
  await db().query(
    `UPDATE import_rows r
        SET outcome = v.outcome::import_row_outcome, outcome_message = v.message,
            step_run_id = v.step_run_id
       FROM jsonb_to_recordset(:outcomes::jsonb)
            AS v(row_number integer, outcome text, message text, step_run_id uuid)
      WHERE r.import_id = :importId AND r.row_number = v.row_number`,
    {
      replacements: {
        importId,
        outcomes: JSON.stringify(
          outcomes.map((o) => ({
            row_number: o.rowNumber,
            outcome: o.outcome,
            message: o.message,
            step_run_id: o.stepRunId,
          })),
        ),
      },
    },
  )
}

async function refreshCounts(imp: Import): Promise<void> {
  const rows = await db().query<{ outcome: string; n: string }>(
    `SELECT outcome, count(*) AS n FROM import_rows WHERE import_id = :id AND outcome IS NOT NULL GROUP BY outcome`,
    { replacements: { id: imp.id }, type: QueryTypes.SELECT },
  )
  const n = (o: string) => Number(rows.find((r) => r.outcome === o)?.n ?? 0)
  await imp.update({
    recordedCount: n('recorded'),
    skippedCount: n('repeat'),
    failedCount: n('refused'),
  })
}

/**
 * The job: every good row not yet done, in file order, goes through `recordStepRun()` (the
 * Floor's own route rules and exactly-once by event id) as the importing user at the import's
 * station. A refusal is kept with its words; anything else is thrown, for BullMQ to retry, and
 * the retry picks up where this one stopped. Safe to run twice.
 */
export async function processImport(
  id: string,
  onProgress: (percent: number) => Promise<void> = async () => {},
): Promise<void> {
  const imp = await Import.findByPk(id)
  if (!imp) throw new Error(`import ${id} does not exist`)
  if (!['queued', 'running'].includes(imp.status)) return
  const station = (await Station.findByPk(imp.stationId))!
  const user = await User.findByPk(imp.createdBy)
  if (!user?.isActive || !can(user.role, 'importBenchData')) {
    await imp.update({ status: 'failed', error: 'the importing user may no longer import' })
    return
  }
  const actor: Actor = { id: user.id, email: user.email }
  await imp.update({ status: 'running', startedAt: imp.startedAt ?? new Date(), error: null })
  const total = await ImportRow.count({ where: readyWhere(id) })
  let done = await ImportRow.count({ where: { ...readyWhere(id), outcome: { [Op.ne]: null } } })
  const report = progressReporter(imp, onProgress)
  const progress = () => report(total ? (done / total) * 100 : 99)
  // Outcomes are written 50 at a time, in one statement: a crash loses at most the last few
  // rows' words, and the retry finds those step runs by event id and calls them repeats.
  let pending: Outcome[] = []
  const flush = async () => {
    await writeOutcomes(id, pending)
    pending = []
  }
  for (;;) {
    const batch = await ImportRow.findAll({
      where: { ...readyWhere(id), outcome: null } as WhereOptions<ImportRow>,
      order: [['rowNumber', 'ASC']],
      limit: 200,
    })
    if (!batch.length) break
    try {
      for (const row of batch) {
        const input = StepRunInput.parse({
          clientEventId: row.clientEventId,
          serial: row.serial,
          stationCode: station.code,
          values: row.values,
          defectCodeId: row.result === 'fail' ? imp.defectCodeId : null,
          note: stepRunNote(imp, row),
        })
        try {
          const { isRepeat, body } = await recordStepRun(input, actor)
          pending.push({
            rowNumber: row.rowNumber,
            outcome: isRepeat ? 'repeat' : 'recorded',
            message: isRepeat ? 'already recorded; nothing new was written' : recordedWords(body),
            stepRunId: body.stepRun.id,
          })
        } catch (err) {
          if (!(err instanceof AppError) || err.status >= 500) throw err
          pending.push({
            rowNumber: row.rowNumber,
            outcome: 'refused',
            message: err.message,
            stepRunId: null,
          })
        }
        done++
        if (pending.length >= 50) await flush()
        await progress()
      }
    } finally {
      await flush()
    }
  }
  await refreshCounts(imp)
  await imp.update({ status: 'done', progress: 100, finishedAt: new Date() })
  await onProgress(100)
  logger.info({ importId: id, recorded: imp.recordedCount }, 'bench import done')
}

/** Marks an import stopped after its job's last attempt, with the reason for the screen. */
export async function failImport(id: string, reason: string): Promise<void> {
  const imp = await Import.findByPk(id)
  if (!imp || imp.status === 'done') return
  const error = reason.slice(0, 500)
  // A dry run that could not finish leaves the file as it was, to be checked again.
  if (imp.status === 'checking') {
    await imp.update({ status: imp.checkedAt ? 'checked' : 'uploaded', progress: 0, error })
    return
  }
  await refreshCounts(imp)
  await imp.update({ status: 'failed', error })
}

/** An import whose job the sweeper enqueues again: its dry run, or its import. */
export interface PendingImport {
  id: string
  kind: 'check' | 'run'
  /** Part of the check job's id, so a new dry run of the same file gets a job of its own. */
  updatedAt: Date
}

/** Imports still waiting after `olderThanMs`, which the sweeper enqueues again. */
export async function pendingImports(now: Date, olderThanMs: number): Promise<PendingImport[]> {
  const rows = await Import.findAll({
    // A `running` row untouched for ten minutes lost its worker; queued and checking ones
    // lost their job (or are slow: the job ids make a second enqueue of the same one a no-op).
    where: {
      [Op.or]: [
        {
          status: { [Op.in]: ['queued', 'checking'] },
          updatedAt: { [Op.lt]: new Date(now.getTime() - olderThanMs) },
        },
        { status: 'running', updatedAt: { [Op.lt]: new Date(now.getTime() - 10 * 60_000) } },
      ],
    },
    attributes: ['id', 'status', 'updatedAt'],
    limit: 500,
  })
  if (rows.length)
    logger.info({ count: rows.length }, 'imports found waiting; enqueueing them again')
  return rows.map((r) => ({
    id: r.id,
    kind: r.status === 'checking' ? 'check' : 'run',
    updatedAt: r.updatedAt,
  }))
}
