import { Op } from 'sequelize'
import type { WhereOptions } from 'sequelize'
import type { ImportRowOutcome } from '../../../shared/imports'
import { can } from '../../../shared/permissions'
import type { ImportRunInput } from '../../../shared/schemas/imports'
import { UNIT_STATE_LABELS } from '../../../shared/lots'
import { StepRunInput } from '../../../shared/schemas/lots'
import type { StepRunResultDto } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import { logger } from '../../logger'
import { DefectCode, Import, ImportRow, Station, User } from '../../models'
import { execute, withTransaction } from '../../db/sql'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { recordStepRun } from '../floor'
import { progressReporter, refreshCounts } from './importJobs'
import { loadImport, readyWhere } from './loadImport'

// The import itself: asked for once the dry run is checked, then done by a job that records
// each good row as a step run through the Floor's own rules, keeping each row's outcome.

/**
 * Asks for the import of a checked file's good rows: the row goes to `queued` in one transaction
 * with its audit event, then the job is enqueued (the sweeper enqueues it if Redis is away).
 */
export async function requestImportRun(
  id: string,
  input: ImportRunInput,
  actor: Actor,
): Promise<Import> {
  return withTransaction(async (transaction) => {
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
    await auditAction(
      actor,
      'import.run',
      id,
      {
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
  await execute(
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
