import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import type { LotStatus, UnitState } from '../../shared/lots'
import type { StationKind } from '../../shared/stations'
import { evaluateChecks } from '../../shared/recipes/evaluate'
import type { CheckResult } from '../../shared/recipes/evaluate'
import type { StepRunInput, StepRunResultDto } from '../../shared/schemas/lots'
import type { CheckDto } from '../../shared/schemas/recipes'
import { codeFromScan } from '../../shared/links'
import { isValidSerial, looksLikeSerial } from '../../shared/serials'
import { AppError } from '../errors'
import { isUniqueViolation, namedSql, txQuery } from '../db/txSql'
import { db, Nonconformance, StepRun, Unit } from '../models'
import type { Actor } from './audit'
import { applyConsumptions, planConsumptions } from './consumptions'
import { verifyCountersign } from './countersign'
import { unitRefusal } from './floorRules'
import { unitAfterRun, unitSummary } from './unitMoves'
import { stepPlan } from './stepPlans'
import type { StepPlan } from './stepPlans'

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
export async function findUnitByScan(
  scanned: string,
  transaction?: Transaction,
  lock = false,
): Promise<Unit> {
  const serial = codeFromScan(scanned)
  const unit = await Unit.findOne({
    where: { serial },
    transaction,
    lock: lock && transaction ? transaction.LOCK.UPDATE : undefined,
  })
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

function measurementRows(checks: CheckDto[], results: Record<string, CheckResult>) {
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

/** The unit row as the scan transaction locks it. */
interface LockedUnit {
  id: string
  serial: string
  lotId: string
  state: UnitState
  currentStepId: string | null
  reworkCount: number
  reworkUntilPosition: number | null
  finishedAt: Date | null
  holdReason: string
  holdKind: Unit['holdKind']
  heldFromState: UnitState | null
}

/** What else a scan needs to know, read in one statement once the unit is locked. */
interface ScanContext {
  lotNumber: string
  lotStatus: LotStatus
  lotIsOnHold: boolean
  lotHoldReason: string
  stationId: string | null
  stationCode: string
  stationName: string
  stationKind: StationKind
  stationIsActive: boolean
  earlierId: string | null
  runsAtStep: number
  isDefectCodeKnown: boolean
}

// The hot path of the Floor runs as plain SQL on the transaction's connection: four round trips
// (lock, context, write, commit) where the ORM took fifteen. `bench:scan` measures it.
const LOCK_UNIT = namedSql(
  'scan-lock-unit',
  `
  SELECT id, serial, lot_id AS "lotId", state, current_step_id AS "currentStepId",
         rework_count AS "reworkCount", rework_until_position AS "reworkUntilPosition",
         finished_at AS "finishedAt", hold_reason AS "holdReason", hold_kind AS "holdKind",
         held_from_state AS "heldFromState"
    FROM units WHERE serial = $1 FOR UPDATE`,
)

// A statement of its own after the lock, so that under READ COMMITTED it sees whatever the
// transaction we waited for committed (its step run, its event id).
const SCAN_CONTEXT = namedSql(
  'scan-context',
  `
  SELECT l.number AS "lotNumber", l.status AS "lotStatus", l.is_on_hold AS "lotIsOnHold",
         l.hold_reason AS "lotHoldReason",
         s.id AS "stationId", s.code AS "stationCode", s.name AS "stationName",
         s.kind AS "stationKind", s.is_active AS "stationIsActive",
         e.id AS "earlierId",
         (SELECT count(*)::int FROM step_runs r WHERE r.unit_id = $1 AND r.step_id = $2) AS "runsAtStep",
         ($5::uuid IS NULL OR EXISTS (SELECT 1 FROM defect_codes d WHERE d.id = $5)) AS "isDefectCodeKnown"
    FROM lots l
    LEFT JOIN stations s ON s.code = $3
    LEFT JOIN step_runs e ON e.client_event_id = $4
   WHERE l.id = $6`,
)

/**
 * The one statement that writes a step run: the run, its measurements, the unit's move with its
 * run counters, the lot's day with a run (both read by the Yield board, yieldQueries.ts), the
 * lot's first start, the nonconformance of a fail and the audit row.
 */
function writeRunText(isFail: boolean): string {
  return `
  WITH run AS (
    INSERT INTO step_runs (id, unit_id, step_id, station_id, operator_id, countersigned_by,
                           attempt, is_rework, result, note, client_event_id, started_at, finished_at)
    VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $12)
  ), measured AS (
    INSERT INTO measurements (step_run_id, check_id, value_number, value_text, value_boolean,
                              is_derived, is_pass)
    SELECT $1::uuid, * FROM unnest($13::uuid[], $14::float8[], $15::text[], $16::bool[], $17::bool[], $18::bool[])
  ), moved AS (
    UPDATE units SET state = $19, current_step_id = $20, rework_until_position = $21,
                     finished_at = $22, hold_kind = $23, held_from_state = $24,
                     hold_reason = $25, updated_at = $12,
                     run_count = run_count + 1,
                     fail_count = fail_count + ${isFail ? 1 : 0},
                     first_attempt_count = first_attempt_count + CASE WHEN $7 = 1 THEN 1 ELSE 0 END
     WHERE id = $2
  ), dated AS (
    INSERT INTO lot_run_days (lot_id, day) VALUES ($26, ($12 AT TIME ZONE 'UTC')::date)
    ON CONFLICT DO NOTHING
  ), started AS (
    UPDATE lots SET status = 'in_progress', updated_at = $12 WHERE id = $26 AND status = 'released'
  ), audited AS (
    INSERT INTO audit_events (at, actor_id, actor_email, action, entity, entity_id, after, ip, request_id)
    VALUES ($12, $5, $27, 'step_run.record', 'unit', $2::text, $28::jsonb, $29, $30)
  )${
    isFail
      ? `, opened AS (
    INSERT INTO nonconformances (id, unit_id, step_run_id, defect_code_id, description,
                                 failed_checks, opened_by, opened_at)
    VALUES ($31, $2, $1, $32, $10, $33::jsonb, $5, $12)
  )`
      : ''
  }
  SELECT 1`
}
const WRITE_PASS = namedSql('scan-write-pass', writeRunText(false))
const WRITE_FAIL = namedSql('scan-write-fail', writeRunText(true))

async function record(
  input: StepRunInput,
  actor: Actor,
  transaction: Transaction,
  at: Date,
): Promise<{ body: StepRunResultDto; lotId: string; stepId: string } | { repeat: StepRun }> {
  // The row lock on the unit serialises every submission for it: a second station waits here,
  // then finds the unit moved on; a retried submission finds its own step run.
  const serial = codeFromScan(input.serial)
  const [unit] = await txQuery<LockedUnit>(transaction, LOCK_UNIT, [serial])
  if (!unit) throw noSuchUnit(serial)
  const [ctx] = await txQuery<ScanContext>(transaction, SCAN_CONTEXT, [
    unit.id,
    unit.currentStepId,
    input.stationCode,
    input.clientEventId,
    input.defectCodeId,
    unit.lotId,
  ])
  if (ctx!.earlierId) return { repeat: (await StepRun.findByPk(ctx!.earlierId, { transaction }))! }
  if (!ctx!.stationId) throw AppError.notFound(`station ${input.stationCode}`)
  const station = {
    code: ctx!.stationCode,
    name: ctx!.stationName,
    kind: ctx!.stationKind,
    isActive: ctx!.stationIsActive,
  }
  const lot = {
    number: ctx!.lotNumber,
    status: ctx!.lotStatus,
    isOnHold: ctx!.lotIsOnHold,
    holdReason: ctx!.lotHoldReason,
  }
  // No lock on the lot: holding a lot locks each of its open units, which this run holds.
  const step = unit.currentStepId ? await stepPlan(unit.currentStepId, transaction) : null
  const refusal = unitRefusal(unit, lot, step, station)
  if (refusal || !step)
    throw AppError.conflict(
      refusal?.code ?? 'no_step',
      refusal?.message ?? `${unit.serial} has no step to do`,
    )
  const checks = step.checks
  checkTypedValues(checks, input.values)
  const results = evaluateChecks(checks, input.values, step.windings)
  const failed = checks.filter((c) => results[c.key]!.verdict !== 'pass')
  const result = failed.length ? 'fail' : 'pass'
  if (result === 'fail' && !input.defectCodeId)
    throw AppError.badRequest('defectCodeId: choose a defect code for the failed check', {
      defectCodeId: 'choose a defect code',
    })
  if (!ctx!.isDefectCodeKnown)
    throw AppError.badRequest('defectCodeId: no such defect code', {
      defectCodeId: 'no such defect code',
    })
  const planned =
    step.bomLines.length > 0
      ? await planConsumptions(step.bomLines, input.consumptions, transaction)
      : []
  const second = step.requiresSignoff
    ? await verifyCountersign(
        input.countersign,
        actor,
        ['operator', 'lead', 'engineer'],
        `${step.name}`,
        transaction,
      )
    : null
  const attempt = ctx!.runsAtStep + 1
  const now = at
  const runId = randomUUID()
  const failedKeys = failed.map((c) => c.key)
  const move = unitAfterRun(unit, step, failedKeys, now)
  const rows = measurementRows(checks, results)
  const audit = {
    serial: unit.serial,
    step: step.name,
    result,
    attempt,
    station: station.code,
    countersignedBy: second?.email ?? null,
  }
  const ncId = result === 'fail' ? randomUUID() : null
  await txQuery(transaction, result === 'fail' ? WRITE_FAIL : WRITE_PASS, [
    runId,
    unit.id,
    step.id,
    ctx!.stationId,
    actor.id,
    second?.id ?? null,
    attempt,
    unit.state === 'in_rework',
    result,
    input.note,
    input.clientEventId,
    now,
    rows.map((r) => r.checkId),
    rows.map((r) => r.valueNumber),
    rows.map((r) => r.valueText),
    rows.map((r) => r.valueBoolean),
    rows.map((r) => r.isDerived),
    rows.map((r) => r.isPass),
    move.state,
    move.currentStepId,
    move.reworkUntilPosition,
    move.finishedAt,
    move.holdKind,
    move.heldFromState,
    move.holdReason,
    unit.lotId,
    actor.email,
    JSON.stringify(audit),
    actor.ip ?? null,
    actor.requestId ?? null,
    ...(ncId ? [ncId, input.defectCodeId, JSON.stringify(failedKeys)] : []),
  ])
  if (planned.length > 0) await applyConsumptions(planned, unit.id, runId, transaction)
  const body: StepRunResultDto = {
    stepRun: { id: runId, result, attempt },
    unit: {
      serial: unit.serial,
      state: move.state,
      currentStep: result === 'pass' ? step.next : stepRef(step),
      reworkCount: unit.reworkCount,
    },
    nonconformanceId: ncId,
  }
  return { body, lotId: unit.lotId, stepId: step.id }
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
    const out = await db().transaction((t) => record(input, actor, t, at))
    if ('repeat' in out) return { isRepeat: true, body: await resultOf(out.repeat, input) }
    return { isRepeat: false, body: out.body, lotId: out.lotId, stepId: out.stepId }
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
