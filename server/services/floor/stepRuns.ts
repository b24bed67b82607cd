// The scan's two paths (fast and locked) in the order of their reads, locks and writes; the
// decision they share, from what was read to what is written, is in stepRunDecision.ts.
import type { Transaction } from 'sequelize'
import type { StepRunInput, StepRunResultDto } from '../../../shared/schemas/lots'
import { codeFromScan } from '../../../shared/links'
import { isValidSerial, looksLikeSerial } from '../../../shared/serials'
import { AppError } from '../../errors'
import { coalesce } from '../../db/coalesce'
import { Nonconformance, StepRun, Unit } from '../../models'
import type { Actor } from '../admin'
import { enqueueAlertCheck } from '../quality'
import { applyConsumptions, lockComponentLots, serialsFittedAlready } from './consumptions'
import { readCountersign } from '../auth'
import { unitSummary } from '../units'
import { decide } from './stepRunDecision'
import type { Decided, Extra } from './stepRunDecision'
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
import type { RunWrite, ScanContext, ScanKey, ScanRow, ScannedUnit } from './stepRunSql'
import {
  isUniqueViolation,
  prepared,
  retryOnConflict,
  txQuery,
  withTransaction,
} from '../../db/sql'

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
  const rows = await prepared<ScanRow & { index: number }>(READ_SCANS, readScansValues(keys))
  const found: (ScanRow | null)[] = keys.map(() => null)
  for (const { index, ...row } of rows) found[index - 1] = row
  return found
}, BATCHING)

/** Writes the runs of a batch; answers, for each, whether its unit moved (and so was written). */
const writeRun = coalesce(async (batch: RunWrite[]): Promise<boolean[]> => {
  const rows = await prepared<{ runId: string }>(WRITE_RUNS, writeRunsValues(batch))
  const written = new Set(rows.map((r) => r.runId))
  return batch.map((w) => written.has(w.runId))
}, BATCHING)

// A scan that fits parts or needs a second signature reads more than the batched read gives:
// its component lots, locked so that their quantities hold until the write, and the signer.
const readsUnderLock = (step: StepPlan | null) =>
  step !== null && (step.bomLines.length > 0 || step.requiresSignoff)

type Recorded = Decided | { repeatOf: string }

/** What the locked path must lock before the unit: the unit's lot, if the read saw it released. */
interface LockFirst {
  lotId: string | null
}

/**
 * The fast path: one read and one write on the plain pool, each shared with the scans that arrive
 * at the same time. Answers what to lock first when the scan needs the locked path: it consumes
 * component lots or needs a second sign-off (it reads more, under the lock), it is among its
 * lot's first (it moves the lot to in progress), or the unit changed between the read and the
 * write (the write then changed nothing).
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
  if (row.earlierId) return { repeatOf: row.earlierId }
  // A lot's first scans move it to in progress, which locks the lot: a lot is locked before its
  // units (as a hold does, lots.ts), so they go the locked way, which takes the lot first. A lot
  // never goes back to released, so a lot read in progress (or closed) needs no lock: holding it
  // changes each of its open units, which the write checks.
  const lockFirst = { lotId: row.lotStatus === 'released' ? row.lotId : null }
  const step = row.currentStepId ? await stepPlan(row.currentStepId) : null
  if (readsUnderLock(step) || lockFirst.lotId) return lockFirst
  const decided = await decide(
    row,
    { step, componentLots: [], fittedSerials: [], countersign: null },
    input,
    actor,
    at,
  )
  return (await writeRun(decided.write)) ? decided : lockFirst
}

/**
 * The locked path: the lot's row lock while it may still be released, then the unit's, then the
 * context, the component lots (locked), the part serials already fitted and the countersign; the
 * decision; then the write and its consumptions.
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
  const row: ScanRow = { ...unit, ...ctx! }
  if (row.earlierId) return { repeatOf: row.earlierId }
  const step = row.currentStepId ? await stepPlan(row.currentStepId, transaction) : null
  const componentLots = step?.bomLines.length
    ? await lockComponentLots(step.bomLines, input.consumptions, transaction)
    : []
  const extra: Extra = {
    step,
    componentLots,
    fittedSerials: await serialsFittedAlready(
      step?.bomLines ?? [],
      componentLots,
      input.consumptions,
      transaction,
    ),
    countersign: step?.requiresSignoff
      ? await readCountersign(input.countersign, transaction)
      : null,
  }
  const decision = await decide(row, extra, input, actor, at)
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
  return withTransaction((t) => recordLocked(input, actor, t, at, out))
}

/** The answer to a submission, and for a new run the lot and step it was recorded at. */
export type RecordedStepRun =
  | { isRepeat: true; body: StepRunResultDto }
  | { isRepeat: false; body: StepRunResultDto; lotId: string; stepId: string }

/**
 * Records one step run from the Floor or a bench import: reads the unit and everything its scan
 * needs, has decideStepRun (shared/floor/decideStepRun.ts) recompute every verdict and derived
 * value and check the route rules, component lots and countersign, then stores the run with its
 * measurements and consumptions and moves the unit on, exactly once per `clientEventId`. A new
 * run asks for the alert check of its lot's step once committed.
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
      // the decision, which names the unit; once only, whatever happens.
      if (!isUniqueViolation(err, 'consumptions_part_serial_key')) throw err
      return recordOnce(input, actor, at)
    })
    if ('repeatOf' in out)
      return {
        isRepeat: true,
        body: await resultOf((await StepRun.findByPk(out.repeatOf))!, input),
      }
    const { lotId, stepId } = out.write
    // After the commit, for every caller (the Floor, the bench import, the demo seed): a new run
    // may change the figures the alerts judge. Not awaited, so a scan never waits on Redis; an
    // outage is logged, and the alerts worker's sweep re-evaluates recent steps once it is back.
    void enqueueAlertCheck(lotId, stepId)
    return { isRepeat: false, body: out.body, lotId, stepId }
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
