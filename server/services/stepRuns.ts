import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import { evaluateChecks } from '../../shared/recipes/evaluate'
import type { CheckResult } from '../../shared/recipes/evaluate'
import type { StepRunInput, StepRunResultDto } from '../../shared/schemas/lots'
import type { CheckDto } from '../../shared/schemas/recipes'
import { codeFromScan } from '../../shared/links'
import { isValidSerial, looksLikeSerial } from '../../shared/serials'
import { AppError } from '../errors'
import { sqlPool } from '../db/pool'
import { coalesce } from '../db/coalesce'
import { isUniqueViolation, txQuery } from '../db/txSql'
import { retryOnConflict } from '../db/retry'
import { db, Nonconformance, StepRun, Unit } from '../models'
import type { Actor } from './audit'
import { applyConsumptions, planConsumptions } from './consumptions'
import type { PlannedConsumption } from './consumptions'
import { verifyCountersign } from './countersign'
import { unitRefusal } from './floorRules'
import { unitAfterRun, unitSummary } from './unitMoves'
import { stepPlan } from './stepPlans'
import type { StepPlan } from './stepPlans'
import {
  LOCK_RELEASED_LOT,
  LOCK_UNIT,
  READ_SCANS,
  readScansValues,
  SCAN_CONTEXT,
  WRITE_RUNS,
  writeRunsValues,
} from './stepRunSql'
import type {
  MeasurementRow,
  RunWrite,
  ScanContext,
  ScanKey,
  ScanRow,
  ScannedUnit,
} from './stepRunSql'

const stepRef = (s: StepPlan) => ({
  id: s.id,
  name: s.name,
  stationKind: s.stationKind,
  position: s.position,
})

/** The answer to a serial that names no unit: mistyped (bad check character) or unknown. */
function noSuchUnit(serial: string): AppError {
  if (looksLikeSerial(serial) && !isValidSerial(serial))
    return new AppError(
      400,
      'mistyped_serial',
      `${serial} is mistyped: its check character does not match; scan it again or type it carefully`,
      { serial: 'mistyped' },
    )
  return new AppError(404, 'unknown_serial', `no unit ${serial}: check the traveler`, {
    serial: 'unknown',
  })
}

/** Finds a unit by what was scanned; a mistyped serial (bad check character) is a 400. */
export async function findUnitByScan(scanned: string): Promise<Unit> {
  const serial = codeFromScan(scanned)
  const unit = await Unit.findOne({ where: { serial } })
  if (unit) return unit
  throw noSuchUnit(serial)
}

async function resultOf(run: StepRun, input: StepRunInput): Promise<StepRunResultDto> {
  const unit = (await Unit.findByPk(run.unitId))!
  if (codeFromScan(input.serial) !== unit.serial)
    throw AppError.conflict(
      'event_reused',
      'this submission id was already used for another unit; submit again',
    )
  const nc = await Nonconformance.findOne({ where: { stepRunId: run.id } })
  return {
    stepRun: { id: run.id, result: run.result, attempt: run.attempt },
    unit: await unitSummary(unit),
    nonconformanceId: nc?.id ?? null,
  }
}

/** Typed values must be present and of the check's kind; the 400 names each bad check. */
function checkTypedValues(checks: CheckDto[], values: StepRunInput['values']): void {
  const fields: Record<string, string> = {}
  for (const c of checks.filter((c) => !c.derived)) {
    const v = values[c.key]
    const field = `values.${c.key}`
    if (v === undefined || v === null || v === '') fields[field] = `enter ${c.label}`
    else if (c.kind === 'numeric' && typeof v !== 'number') fields[field] = 'must be a number'
    else if (c.kind === 'boolean' && typeof v !== 'boolean') fields[field] = 'must be yes or no'
    else if ((c.kind === 'text' || c.kind === 'choice') && typeof v !== 'string')
      fields[field] = 'must be text'
    else if (c.kind === 'choice' && !c.choices?.some((o) => o.value === v))
      fields[field] = 'not one of the choices'
  }
  const [first] = Object.entries(fields)
  if (first) throw AppError.badRequest(`${first[0]}: ${first[1]}`, fields)
}

function measurementRows(
  checks: CheckDto[],
  results: Record<string, CheckResult>,
): MeasurementRow[] {
  return checks.map((c) => {
    const r = results[c.key]!
    return {
      checkId: c.id,
      valueNumber: typeof r.value === 'number' ? r.value : null,
      valueText: typeof r.value === 'string' ? r.value : null,
      valueBoolean: typeof r.value === 'boolean' ? r.value : null,
      isDerived: r.isDerived,
      isPass: r.verdict === 'pass',
    }
  })
}

// Most scans run as two statements on the plain pool, without a transaction of their own: one
// read of everything the scan needs, then one write that moves the unit only if it is still as
// read (see WRITE_RUNS). The UPDATE takes the unit's row lock inside the write's own
// transaction, so a second station waits for the first and then finds the unit changed. Scans
// that arrive together share each statement: under load, many scans cost two round trips. Up to
// eight batches of each statement run at once, so PostgreSQL can work on the second core while
// this process builds the next batch (the plain pool caps them at ten connections in all);
// scripts/bench/scan.ts did as well or better with eight than with two, four or five.
const BATCHING = { maxInFlight: 8 }

const readScan = coalesce(async (keys: ScanKey[]): Promise<(ScanRow | null)[]> => {
  const { rows } = await sqlPool().query<ScanRow & { index: number }>({
    ...READ_SCANS,
    values: readScansValues(keys),
  })
  const found: (ScanRow | null)[] = keys.map(() => null)
  for (const { index, ...row } of rows) found[index - 1] = row
  return found
}, BATCHING)

/** Writes the runs of a batch; answers, for each, whether its unit moved (and so was written). */
const writeRun = coalesce(async (batch: RunWrite[]): Promise<boolean[]> => {
  const { rows } = await sqlPool().query<{ runId: string }>({
    ...WRITE_RUNS,
    values: writeRunsValues(batch),
  })
  const written = new Set(rows.map((r) => r.runId))
  return batch.map((w) => written.has(w.runId))
}, BATCHING)

/** A scan decided: what it writes, and what to answer once it is written. */
interface Decision {
  write: RunWrite
  planned: PlannedConsumption[]
  body: StepRunResultDto
}

/**
 * Checks a scan against the route rules and recomputes its verdicts from what was read: a
 * refusal throws, a repeated submission answers its earlier run's id. Without a transaction
 * (the unlocked read), a scan that must lock more than its unit answers 'needs_lock'.
 */
async function decide(
  row: ScanRow,
  input: StepRunInput,
  actor: Actor,
  at: Date,
  transaction: Transaction | null,
): Promise<Decision | { repeatOf: string } | 'needs_lock'> {
  if (row.earlierId) return { repeatOf: row.earlierId }
  if (!row.stationId) throw AppError.notFound(`station ${input.stationCode}`)
  const station = {
    code: row.stationCode,
    name: row.stationName,
    kind: row.stationKind,
    isActive: row.stationIsActive,
  }
  const lot = {
    number: row.lotNumber,
    status: row.lotStatus,
    isOnHold: row.lotIsOnHold,
    holdReason: row.lotHoldReason,
  }
  // No lock on the lot: holding a lot changes each of its open units, which the write checks.
  const step = row.currentStepId
    ? await stepPlan(row.currentStepId, transaction ?? undefined)
    : null
  const refusal = unitRefusal(row, lot, step, station)
  if (refusal || !step)
    throw AppError.conflict(
      refusal?.code ?? 'no_step',
      refusal?.message ?? `${row.serial} has no step to do`,
    )
  // Known before any check is evaluated, so such a scan does that work once, under the lock.
  // A lot's first scans move it to in progress, which locks the lot: a lot is locked before its
  // units (as a hold does, lots.ts), so they go the locked way, which takes the lot first.
  if (
    !transaction &&
    (step.bomLines.length > 0 || step.requiresSignoff || row.lotStatus === 'released')
  )
    return 'needs_lock'
  const checks = step.checks
  checkTypedValues(checks, input.values)
  const results = evaluateChecks(checks, input.values, step.windings)
  const failed = checks.filter((c) => results[c.key]!.verdict !== 'pass')
  const result = failed.length ? 'fail' : 'pass'
  if (result === 'fail' && !input.defectCodeId)
    throw AppError.badRequest('defectCodeId: choose a defect code for the failed check', {
      defectCodeId: 'choose a defect code',
    })
  if (!row.isDefectCodeKnown)
    throw AppError.badRequest('defectCodeId: no such defect code', {
      defectCodeId: 'no such defect code',
    })
  const planned =
    step.bomLines.length > 0 && transaction
      ? await planConsumptions(step.bomLines, input.consumptions, transaction)
      : []
  const second =
    step.requiresSignoff && transaction
      ? await verifyCountersign(
          input.countersign,
          actor,
          ['operator', 'lead', 'engineer'],
          `${step.name}`,
          transaction,
        )
      : null
  const attempt = row.runsAtStep + 1
  const now = at
  const runId = randomUUID()
  const failedKeys = failed.map((c) => c.key)
  const move = unitAfterRun(row, step, failedKeys, now)
  const audit = {
    serial: row.serial,
    step: step.name,
    result,
    attempt,
    station: station.code,
    countersignedBy: second?.email ?? null,
  }
  const ncId = result === 'fail' ? randomUUID() : null
  const write: RunWrite = {
    runId,
    unitId: row.id,
    stepId: step.id,
    stationId: row.stationId,
    operatorId: actor.id,
    countersignedBy: second?.id ?? null,
    attempt,
    isRework: row.state === 'in_rework',
    result,
    note: input.note,
    clientEventId: input.clientEventId,
    at: now,
    measurements: measurementRows(checks, results),
    move,
    lotId: row.lotId,
    actorEmail: actor.email,
    audit: JSON.stringify(audit),
    ip: actor.ip ?? null,
    requestId: actor.requestId ?? null,
    // The unit as read: the write moves it only if it is still so.
    read: { runCount: row.runCount, state: row.state, reworkCount: row.reworkCount },
    nonconformance: ncId
      ? { id: ncId, defectCodeId: input.defectCodeId!, failedChecks: JSON.stringify(failedKeys) }
      : null,
  }
  const body: StepRunResultDto = {
    stepRun: { id: runId, result, attempt },
    unit: {
      serial: row.serial,
      state: move.state,
      currentStep: result === 'pass' ? step.next : stepRef(step),
      reworkCount: row.reworkCount,
    },
    nonconformanceId: ncId,
  }
  return { write, planned, body }
}

type Recorded = Decision | { repeatOf: string }

/** What the locked path must lock before the unit: the unit's lot, if the read saw it released. */
interface LockFirst {
  lotId: string | null
}

/**
 * The fast path: one read and one write on the plain pool, each shared with the scans that arrive
 * at the same time. Answers what to lock first when the scan needs the locked path: it consumes
 * component lots, needs a second sign-off or is among its lot's first (it moves the lot to in
 * progress), or the unit changed between the read and the write (the write then changed nothing).
 */
async function recordUnlocked(
  input: StepRunInput,
  actor: Actor,
  at: Date,
): Promise<Recorded | LockFirst> {
  const serial = codeFromScan(input.serial)
  const row = await readScan({
    serial,
    stationCode: input.stationCode,
    clientEventId: input.clientEventId,
    defectCodeId: input.defectCodeId,
  })
  if (!row) throw noSuchUnit(serial)
  // A lot never goes back to released, so a lot read in progress (or closed) needs no lock.
  const lockFirst = { lotId: row.lotStatus === 'released' ? row.lotId : null }
  const decision = await decide(row, input, actor, at, null)
  if (decision === 'needs_lock') return lockFirst
  if ('repeatOf' in decision) return decision
  return (await writeRun(decision.write)) ? decision : lockFirst
}

/**
 * The locked path: the lot's row lock while it may still be released, then the unit's, then the
 * context, the write and its consumptions.
 */
async function recordLocked(
  input: StepRunInput,
  actor: Actor,
  transaction: Transaction,
  at: Date,
  lockFirst: LockFirst,
): Promise<Recorded> {
  // Only WRITE_RUNS' move of a released lot to in progress locks a lot; taking that lock before
  // the unit's keeps the one order (lot, then units) that a hold takes too. Once the lot is in
  // progress the statement finds no row and locks nothing, so later scans do not queue on it.
  if (lockFirst.lotId) await txQuery(transaction, LOCK_RELEASED_LOT, [lockFirst.lotId])
  // The row lock on the unit serialises every submission for it: a second station waits here,
  // then finds the unit moved on; a retried submission finds its own step run.
  const serial = codeFromScan(input.serial)
  const [unit] = await txQuery<ScannedUnit>(transaction, LOCK_UNIT, [serial])
  if (!unit) throw noSuchUnit(serial)
  const [ctx] = await txQuery<ScanContext>(transaction, SCAN_CONTEXT, [
    unit.id,
    unit.currentStepId,
    input.stationCode,
    input.clientEventId,
    input.defectCodeId,
    unit.lotId,
  ])
  const decision = await decide({ ...unit, ...ctx! }, input, actor, at, transaction)
  if (decision === 'needs_lock') throw new Error('recordLocked: a locked scan needs no more locks')
  if ('repeatOf' in decision) return decision
  const written = await txQuery<{ runId: string }>(
    transaction,
    WRITE_RUNS,
    writeRunsValues([decision.write]),
  )
  if (written.length !== 1) throw new Error(`recordLocked: ${serial} did not move under its lock`)
  if (decision.planned.length > 0)
    await applyConsumptions(decision.planned, unit.id, decision.write.runId, transaction)
  return decision
}

/** One try at a scan: the fast path, else one transaction on the locked path. */
async function recordOnce(input: StepRunInput, actor: Actor, at: Date): Promise<Recorded> {
  const out = await recordUnlocked(input, actor, at)
  if ('write' in out || 'repeatOf' in out) return out
  return db().transaction((t) => recordLocked(input, actor, t, at, out))
}

/** The answer to a submission, and for a new run the lot and step it was recorded at. */
export type RecordedStepRun =
  | { isRepeat: true; body: StepRunResultDto }
  | { isRepeat: false; body: StepRunResultDto; lotId: string; stepId: string }

/**
 * Records one step run from the Floor: recomputes every verdict and derived value from the
 * values, checks the route rules and component lots, stores the run with its measurements and
 * consumptions and moves the unit on, exactly once per `clientEventId`.
 */
export async function recordStepRun(
  input: StepRunInput,
  actor: Actor,
  /** When the run happened; the demo seed spreads its lots over past days. */
  at: Date = new Date(),
): Promise<RecordedStepRun> {
  try {
    const out = await retryOnConflict(() => recordOnce(input, actor, at)).catch((err) => {
      // Two stations fitted one part serial at once: the unique index let the first in and made
      // the second wait for it. Now that it is committed, the scan decided again is refused by
      // planConsumptions, which names the unit; once only, whatever happens.
      if (!isUniqueViolation(err, 'consumptions_part_serial_key')) throw err
      return recordOnce(input, actor, at)
    })
    if ('repeatOf' in out)
      return {
        isRepeat: true,
        body: await resultOf((await StepRun.findByPk(out.repeatOf))!, input),
      }
    return { isRepeat: false, body: out.body, lotId: out.write.lotId, stepId: out.write.stepId }
  } catch (err) {
    // Two submissions of one event for two different serials can both pass the look-up; the
    // unique constraint lets one in, and the other gets the first one's answer.
    if (isUniqueViolation(err, 'step_runs_client_event_id_key')) {
      const winner = await StepRun.findOne({ where: { clientEventId: input.clientEventId } })
      if (winner) return { isRepeat: true, body: await resultOf(winner, input) }
    }
    throw err
  }
}
