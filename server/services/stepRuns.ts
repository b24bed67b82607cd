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
import { sqlPool } from '../db/pool'
import { isUniqueViolation, namedSql, txQuery } from '../db/txSql'
import type { NamedSql } from '../db/txSql'
import { db, Nonconformance, StepRun, Unit } from '../models'
import type { Actor } from './audit'
import { applyConsumptions, planConsumptions } from './consumptions'
import type { PlannedConsumption } from './consumptions'
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

/** The unit row as a scan reads it; `runCount` is its version (every run adds one). */
interface ScannedUnit {
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
  runCount: number
}

/** What else a scan needs to know about the unit's lot, the station and the submission. */
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

type ScanRow = ScannedUnit & ScanContext

const UNIT_COLUMNS = `
  u.id, u.serial, u.lot_id AS "lotId", u.state, u.current_step_id AS "currentStepId",
  u.rework_count AS "reworkCount", u.rework_until_position AS "reworkUntilPosition",
  u.finished_at AS "finishedAt", u.hold_reason AS "holdReason", u.hold_kind AS "holdKind",
  u.held_from_state AS "heldFromState", u.run_count AS "runCount"`
const CONTEXT_COLUMNS = (unitId: string, stepId: string, defectCodeId: string) => `
  l.number AS "lotNumber", l.status AS "lotStatus", l.is_on_hold AS "lotIsOnHold",
  l.hold_reason AS "lotHoldReason",
  s.id AS "stationId", s.code AS "stationCode", s.name AS "stationName",
  s.kind AS "stationKind", s.is_active AS "stationIsActive",
  e.id AS "earlierId",
  (SELECT count(*)::int FROM step_runs r WHERE r.unit_id = ${unitId} AND r.step_id = ${stepId}) AS "runsAtStep",
  (${defectCodeId}::uuid IS NULL OR EXISTS (SELECT 1 FROM defect_codes d WHERE d.id = ${defectCodeId})) AS "isDefectCodeKnown"`

// Most scans run as two statements on the plain pool, without a transaction of their own: one
// read of everything the scan needs, then one write that moves the unit only if it is still as
// read (see writeRunText). The UPDATE takes the unit's row lock inside the write's own
// transaction, so a second station waits for the first and then finds the unit changed.
const READ_UNLOCKED = namedSql(
  'scan-read',
  `
  SELECT ${UNIT_COLUMNS}, ${CONTEXT_COLUMNS('u.id', 'u.current_step_id', '$4')}
    FROM units u
    JOIN lots l ON l.id = u.lot_id
    LEFT JOIN stations s ON s.code = $2
    LEFT JOIN step_runs e ON e.client_event_id = $3
   WHERE u.serial = $1`,
)

// A scan that consumes component lots, needs a second sign-off, or found the unit changed
// between its read and its write runs in a transaction that locks the unit first (four round
// trips: lock, context, write, commit, where the ORM took fifteen).
const LOCK_UNIT = namedSql(
  'scan-lock-unit',
  `SELECT ${UNIT_COLUMNS} FROM units u WHERE u.serial = $1 FOR UPDATE`,
)

// A statement of its own after the lock, so that under READ COMMITTED it sees whatever the
// transaction we waited for committed (its step run, its event id).
const SCAN_CONTEXT = namedSql(
  'scan-context',
  `
  SELECT ${CONTEXT_COLUMNS('$1', '$2', '$5')}
    FROM lots l
    LEFT JOIN stations s ON s.code = $3
    LEFT JOIN step_runs e ON e.client_event_id = $4
   WHERE l.id = $6`,
)

/**
 * The one statement that writes a step run: the unit's move with its run counters, the run, its
 * measurements, the lot's day with a run (both read by the Yield board, yieldQueries.ts), the
 * lot's first start, the nonconformance of a fail and the audit row. The move happens only if
 * the unit is still at the run count, state, step and rework count the scan read, and
 * everything else only if the unit moved: the statement answers how many units moved (0 or 1).
 */
function writeRunText(isFail: boolean): string {
  return `
  WITH moved AS (
    UPDATE units SET state = $19, current_step_id = $20, rework_until_position = $21,
                     finished_at = $22, hold_kind = $23, held_from_state = $24,
                     hold_reason = $25, updated_at = $12,
                     run_count = run_count + 1,
                     fail_count = fail_count + ${isFail ? 1 : 0},
                     first_attempt_count = first_attempt_count + CASE WHEN $7 = 1 THEN 1 ELSE 0 END
     WHERE id = $2 AND run_count = $31 AND rework_count = $33
       -- Not indexable on purpose: with '=' the planner may walk units_step_state_idx over
       -- every unit queued at the step (a whole lot) instead of taking the primary key.
       AND state IS NOT DISTINCT FROM $32 AND current_step_id IS NOT DISTINCT FROM $3
    RETURNING id
  ), run AS (
    INSERT INTO step_runs (id, unit_id, step_id, station_id, operator_id, countersigned_by,
                           attempt, is_rework, result, note, client_event_id, started_at, finished_at)
    SELECT $1::uuid, $2::uuid, $3::uuid, $4::uuid, $5::uuid, $6::uuid, $7::int, $8::bool,
           $9::step_result, $10::text, $11::uuid, $12::timestamptz, $12::timestamptz
      FROM moved
  ), measured AS (
    INSERT INTO measurements (step_run_id, check_id, value_number, value_text, value_boolean,
                              is_derived, is_pass)
    SELECT $1::uuid, m.*
      FROM moved,
           unnest($13::uuid[], $14::float8[], $15::text[], $16::bool[], $17::bool[], $18::bool[]) m
  ), dated AS (
    INSERT INTO lot_run_days (lot_id, day)
    SELECT $26::uuid, ($12::timestamptz AT TIME ZONE 'UTC')::date FROM moved
    ON CONFLICT DO NOTHING
  ), started AS (
    UPDATE lots SET status = 'in_progress', updated_at = $12
     WHERE id = $26 AND status = 'released' AND EXISTS (SELECT 1 FROM moved)
  ), audited AS (
    INSERT INTO audit_events (at, actor_id, actor_email, action, entity, entity_id, after, ip, request_id)
    SELECT $12::timestamptz, $5::uuid, $27::text, 'step_run.record', 'unit', $2::text,
           $28::jsonb, $29::text, $30::text
      FROM moved
  )${
    isFail
      ? `, opened AS (
    INSERT INTO nonconformances (id, unit_id, step_run_id, defect_code_id, description,
                                 failed_checks, opened_by, opened_at)
    SELECT $34::uuid, $2::uuid, $1::uuid, $35::uuid, $10::text, $36::jsonb, $5::uuid,
           $12::timestamptz
      FROM moved
  )`
      : ''
  }
  SELECT count(*)::int AS moved FROM moved`
}
/** The write of a passing run; exported so a test can read the plan PostgreSQL picks for it. */
export const WRITE_PASS = namedSql('scan-write-pass', writeRunText(false))
const WRITE_FAIL = namedSql('scan-write-fail', writeRunText(true))

/** A scan decided: the write's statement and values, and what to answer once it is written. */
interface Decision {
  write: NamedSql
  values: unknown[]
  planned: PlannedConsumption[]
  runId: string
  body: StepRunResultDto
  lotId: string
  stepId: string
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
  if (!transaction && (step.bomLines.length > 0 || step.requiresSignoff)) return 'needs_lock'
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
  const rows = measurementRows(checks, results)
  const audit = {
    serial: row.serial,
    step: step.name,
    result,
    attempt,
    station: station.code,
    countersignedBy: second?.email ?? null,
  }
  const ncId = result === 'fail' ? randomUUID() : null
  const values = [
    runId,
    row.id,
    step.id,
    row.stationId,
    actor.id,
    second?.id ?? null,
    attempt,
    row.state === 'in_rework',
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
    row.lotId,
    actor.email,
    JSON.stringify(audit),
    actor.ip ?? null,
    actor.requestId ?? null,
    // The unit as read: the write moves it only if it is still so.
    row.runCount,
    row.state,
    row.reworkCount,
    ...(ncId ? [ncId, input.defectCodeId, JSON.stringify(failedKeys)] : []),
  ]
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
  const write = result === 'fail' ? WRITE_FAIL : WRITE_PASS
  return { write, values, planned, runId, body, lotId: row.lotId, stepId: step.id }
}

type Recorded = { body: StepRunResultDto; lotId: string; stepId: string } | { repeatOf: string }

/**
 * The fast path: one read and one write on the plain pool. Answers null when the scan needs the
 * locked path: it consumes component lots or needs a second sign-off, or the unit changed
 * between the read and the write (the write then changed nothing).
 */
async function recordUnlocked(
  input: StepRunInput,
  actor: Actor,
  at: Date,
): Promise<Recorded | null> {
  const serial = codeFromScan(input.serial)
  const pool = sqlPool()
  const read = await pool.query<ScanRow>({
    ...READ_UNLOCKED,
    values: [serial, input.stationCode, input.clientEventId, input.defectCodeId],
  })
  const row = read.rows[0]
  if (!row) throw noSuchUnit(serial)
  const decision = await decide(row, input, actor, at, null)
  if (decision === 'needs_lock') return null
  if ('repeatOf' in decision) return decision
  const written = await pool.query<{ moved: number }>({
    ...decision.write,
    values: decision.values,
  })
  return written.rows[0]!.moved === 1 ? decision : null
}

/** The locked path: the unit's row lock first, then the context, the write and its consumptions. */
async function recordLocked(
  input: StepRunInput,
  actor: Actor,
  transaction: Transaction,
  at: Date,
): Promise<Recorded> {
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
  const [written] = await txQuery<{ moved: number }>(transaction, decision.write, decision.values)
  if (written!.moved !== 1) throw new Error(`recordLocked: ${serial} did not move under its lock`)
  if (decision.planned.length > 0)
    await applyConsumptions(decision.planned, unit.id, decision.runId, transaction)
  return decision
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
    const out =
      (await recordUnlocked(input, actor, at)) ??
      (await db().transaction((t) => recordLocked(input, actor, t, at)))
    if ('repeatOf' in out)
      return {
        isRepeat: true,
        body: await resultOf((await StepRun.findByPk(out.repeatOf))!, input),
      }
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
