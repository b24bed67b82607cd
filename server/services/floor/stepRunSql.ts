import type { LotStatus, UnitState } from '../../../shared/lots'
import type { StationKind } from '../../../shared/stations'
import { namedSql } from '../../db/sql'
import type { Unit } from '../../models'
import type { UnitMove } from '../../../shared/floor/unitAfterRun'

// The scan's statements. The read and the write take arrays, one element per scan, so that scans
// arriving together share one round trip (see coalesce.ts); a scan alone is a batch of one.
//
// The write does in SQL, for speed, what other places own; whoever changes one of these rules
// changes it here too (each of them points back to this file). Parts of WRITE_RUNS:
//   moved           the unit's move, which decideStepRun (shared/floor/decideStepRun.ts) decides,
//                   guarded as DEVELOPERS.md point 6 says; and its run counters, which with
//   dated           (lot_run_days) are the Yield board's rollups: server/db/yieldRollups.ts.
//   run, measured   the step run and its measurements: stepRuns.ts, from the same decision.
//   started         a released lot goes in_progress with its first run: lots.ts.
//   audited         the audit row, as recordAudit() writes it: audit.ts.
//   opened          the nonconformance a fail opens: nonconformances.ts.

/** The unit row as a scan reads it; `runCount` is its version (every run adds one). */
export interface ScannedUnit {
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
export interface ScanContext {
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

export type ScanRow = ScannedUnit & ScanContext

/** What a scan reads by: the serial, the station, its event id and its defect code. */
export interface ScanKey {
  serial: string
  stationCode: string
  clientEventId: string
  defectCodeId: string | null
}

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

/**
 * Everything the unlocked scans of a batch need, without a transaction: one row per scan whose
 * serial names a unit, with `index` its place in the batch (from 1).
 */
export const READ_SCANS = namedSql(
  'scan-read-batch',
  `
  SELECT b.i::int AS "index", ${UNIT_COLUMNS}, ${CONTEXT_COLUMNS('u.id', 'u.current_step_id', 'b.defect')}
    FROM unnest($1::text[], $2::text[], $3::uuid[], $4::uuid[])
           WITH ORDINALITY AS b(serial, station, event, defect, i)
    -- Each look-up is a LATERAL subquery with a LIMIT, which PostgreSQL cannot fold into a join:
    -- it reckons an unnest() of a parameter at 100 rows, and for that many it would rather
    -- hash-join whole tables (growing with every scan) than look each row up by its index.
    CROSS JOIN LATERAL (SELECT * FROM units WHERE serial = b.serial LIMIT 1) u
    CROSS JOIN LATERAL (SELECT * FROM lots WHERE id = u.lot_id LIMIT 1) l
    LEFT JOIN LATERAL (SELECT * FROM stations WHERE code = b.station LIMIT 1) s ON true
    LEFT JOIN LATERAL (SELECT id FROM step_runs WHERE client_event_id = b.event LIMIT 1) e ON true`,
)

/** The values of READ_SCANS for the keys of a batch. */
export const readScansValues = (keys: readonly ScanKey[]): unknown[] => [
  keys.map((k) => k.serial),
  keys.map((k) => k.stationCode),
  keys.map((k) => k.clientEventId),
  keys.map((k) => k.defectCodeId),
]

// A scan that consumes component lots, needs a second sign-off, or found the unit changed
// between its read and its write runs in a transaction that locks the unit first (four round
// trips: lock, context, write, commit, where the ORM took fifteen).
export const LOCK_UNIT = namedSql(
  'scan-lock-unit',
  `SELECT ${UNIT_COLUMNS} FROM units u WHERE u.serial = $1 FOR UPDATE`,
)

// The first scans of a released lot move it to in progress (WRITE_RUNS' 'started'), which locks
// the lot; they take that lock first, before the unit's, as a hold does (lots.ts), so the two
// cannot deadlock. Under READ COMMITTED a scan that waited here finds the lot in progress and no
// row: it holds no lock on the lot, and the scans after it do not queue behind each other.
export const LOCK_RELEASED_LOT = namedSql(
  'scan-lock-released-lot',
  `SELECT id FROM lots WHERE id = $1 AND status = 'released' FOR NO KEY UPDATE`,
)

// A statement of its own after the lock, so that under READ COMMITTED it sees whatever the
// transaction we waited for committed (its step run, its event id).
export const SCAN_CONTEXT = namedSql(
  'scan-context',
  `
  SELECT ${CONTEXT_COLUMNS('$1', '$2', '$5')}
    FROM lots l
    LEFT JOIN stations s ON s.code = $3
    LEFT JOIN step_runs e ON e.client_event_id = $4
   WHERE l.id = $6`,
)

/** One measurement of a run, as stored. */
export interface MeasurementRow {
  checkId: string
  valueNumber: number | null
  valueText: string | null
  valueBoolean: boolean | null
  isDerived: boolean
  isPass: boolean
}

/** Everything one scan writes, and the unit as it was read (the write's guard). */
export interface RunWrite {
  runId: string
  unitId: string
  stepId: string
  stationId: string
  operatorId: string | null
  countersignedBy: string | null
  attempt: number
  isRework: boolean
  result: 'pass' | 'fail'
  note: string
  clientEventId: string
  at: Date
  measurements: MeasurementRow[]
  move: UnitMove
  lotId: string
  actorEmail: string | null
  /** The audit row's `after`, as JSON text. */
  audit: string
  ip: string | null
  requestId: string | null
  read: { runCount: number; state: UnitState; reworkCount: number }
  /** The nonconformance a failed run opens. */
  nonconformance: { id: string; defectCodeId: string; failedChecks: string } | null
}

/** A column of a batched statement: its name, its SQL type, and its value for one element. */
type Column<T> = readonly [name: string, type: string, value: (x: T) => unknown]

/** What WRITE_RUNS takes of each scan, one array parameter per column, in this order. */
const RUN_COLUMNS: readonly Column<RunWrite>[] = [
  ['run_id', 'uuid', (x) => x.runId],
  ['unit_id', 'uuid', (x) => x.unitId],
  ['step_id', 'uuid', (x) => x.stepId],
  ['station_id', 'uuid', (x) => x.stationId],
  ['operator_id', 'uuid', (x) => x.operatorId],
  ['countersigned_by', 'uuid', (x) => x.countersignedBy],
  ['attempt', 'int', (x) => x.attempt],
  ['is_rework', 'bool', (x) => x.isRework],
  ['result', 'step_result', (x) => x.result],
  ['note', 'text', (x) => x.note],
  ['client_event_id', 'uuid', (x) => x.clientEventId],
  ['at', 'timestamptz', (x) => x.at],
  ['new_state', 'unit_state', (x) => x.move.state],
  ['new_step_id', 'uuid', (x) => x.move.currentStepId],
  ['rework_until_position', 'int', (x) => x.move.reworkUntilPosition],
  ['finished_at', 'timestamptz', (x) => x.move.finishedAt],
  ['hold_kind', 'text', (x) => x.move.holdKind],
  ['held_from_state', 'unit_state', (x) => x.move.heldFromState],
  ['hold_reason', 'text', (x) => x.move.holdReason],
  ['lot_id', 'uuid', (x) => x.lotId],
  ['actor_email', 'text', (x) => x.actorEmail],
  ['audit', 'text', (x) => x.audit],
  ['ip', 'text', (x) => x.ip],
  ['request_id', 'text', (x) => x.requestId],
  ['read_run_count', 'int', (x) => x.read.runCount],
  ['read_state', 'unit_state', (x) => x.read.state],
  ['read_rework_count', 'int', (x) => x.read.reworkCount],
  ['nc_id', 'uuid', (x) => x.nonconformance?.id ?? null],
  ['defect_code_id', 'uuid', (x) => x.nonconformance?.defectCodeId ?? null],
  ['failed_checks', 'text', (x) => x.nonconformance?.failedChecks ?? null],
]

/** What WRITE_RUNS takes of each measurement, after the scans' columns. */
const MEASUREMENT_COLUMNS: readonly Column<MeasurementRow & { runId: string }>[] = [
  ['run_id', 'uuid', (m) => m.runId],
  ['check_id', 'uuid', (m) => m.checkId],
  ['n', 'float8', (m) => m.valueNumber],
  ['t', 'text', (m) => m.valueText],
  ['yes', 'bool', (m) => m.valueBoolean],
  ['is_derived', 'bool', (m) => m.isDerived],
  ['is_pass', 'bool', (m) => m.isPass],
]

/** `unnest($k::type[], …) AS alias(name, …)` of columns whose parameters start at $first. */
const unnestOf = <T>(columns: readonly Column<T>[], first: number, alias: string) =>
  `unnest(${columns.map(([, type], i) => `$${first + i}::${type}[]`).join(', ')})
     AS ${alias}(${columns.map(([name]) => name).join(', ')})`

/** The array parameter of one of the scans' columns, such as `$2::uuid[]` for `unit_id`. */
function runParameter(name: string): string {
  const i = RUN_COLUMNS.findIndex(([n]) => n === name)
  if (i < 0) throw new Error(`WRITE_RUNS has no column ${name}`)
  return `$${i + 1}::${RUN_COLUMNS[i]![1]}[]`
}

/**
 * The one statement that writes the step runs of a batch: each unit's move with its run
 * counters, the run, its measurements, the lots' days with a run (read by the Yield board,
 * yieldQueries.ts), the lots' first start, the nonconformance of a fail and the audit row. A
 * unit moves only if it is still at the run count, state, step and rework count its scan read,
 * and everything else of a scan is written only if its unit moved: the statement answers the
 * run ids of the scans that moved their unit. Two scans of one unit in a batch move it once.
 */
export const WRITE_RUNS = namedSql(
  'scan-write-batch',
  `
  WITH b AS (
    SELECT * FROM ${unnestOf(RUN_COLUMNS, 1, 'b')}
  ), moved AS (
    UPDATE units u SET state = b.new_state, current_step_id = b.new_step_id,
                       rework_until_position = b.rework_until_position,
                       finished_at = b.finished_at, hold_kind = b.hold_kind,
                       held_from_state = b.held_from_state, hold_reason = b.hold_reason,
                       updated_at = b.at,
                       run_count = u.run_count + 1,
                       fail_count = u.fail_count + CASE WHEN b.result = 'fail' THEN 1 ELSE 0 END,
                       first_attempt_count = u.first_attempt_count + CASE WHEN b.attempt = 1 THEN 1 ELSE 0 END
      FROM b
     -- '= ANY' beside the join makes the units come through their primary key: PostgreSQL
     -- reckons b at 100 rows and would otherwise hash-join the whole table (see READ_SCANS).
     WHERE u.id = ANY(${runParameter('unit_id')}) AND u.id = b.unit_id AND u.run_count = b.read_run_count
       AND u.rework_count = b.read_rework_count
       -- Not indexable on purpose: with '=' the planner may walk units_step_state_idx over
       -- every unit queued at the step (a whole lot) instead of taking the primary key.
       AND u.state IS NOT DISTINCT FROM b.read_state
       AND u.current_step_id IS NOT DISTINCT FROM b.step_id
    RETURNING b.*
  ), run AS (
    INSERT INTO step_runs (id, unit_id, step_id, station_id, operator_id, countersigned_by,
                           attempt, is_rework, result, note, client_event_id, started_at, finished_at)
    SELECT run_id, unit_id, step_id, station_id, operator_id, countersigned_by, attempt,
           is_rework, result, note, client_event_id, at, at
      FROM moved
  ), measured AS (
    INSERT INTO measurements (step_run_id, check_id, value_number, value_text, value_boolean,
                              is_derived, is_pass)
    SELECT m.*
      FROM ${unnestOf(MEASUREMENT_COLUMNS, RUN_COLUMNS.length + 1, 'm')}
     WHERE m.run_id IN (SELECT run_id FROM moved)
  ), dated AS (
    INSERT INTO lot_run_days (lot_id, day)
    SELECT DISTINCT lot_id, (at AT TIME ZONE 'UTC')::date FROM moved
    ON CONFLICT DO NOTHING
  ), started AS (
    UPDATE lots SET status = 'in_progress', updated_at = f.at
      FROM (SELECT lot_id, min(at) AS at FROM moved GROUP BY lot_id) f
     WHERE lots.id = ANY(${runParameter('lot_id')}) AND lots.id = f.lot_id AND lots.status = 'released'
  ), audited AS (
    INSERT INTO audit_events (at, actor_id, actor_email, action, entity, entity_id, after, ip, request_id)
    SELECT at, operator_id, actor_email, 'step_run.record', 'unit', unit_id::text,
           audit::jsonb, ip, request_id
      FROM moved
  ), opened AS (
    INSERT INTO nonconformances (id, unit_id, step_run_id, defect_code_id, description,
                                 failed_checks, opened_by, opened_at)
    SELECT nc_id, unit_id, run_id, defect_code_id, note, failed_checks::jsonb, operator_id, at
      FROM moved
     WHERE nc_id IS NOT NULL
  )
  SELECT run_id AS "runId" FROM moved`,
)

/**
 * The values of WRITE_RUNS for a batch. The scans go in the order of their units' ids, so two
 * batches that share units lock them in the same order and cannot deadlock.
 */
export function writeRunsValues(batch: readonly RunWrite[]): unknown[] {
  const w = [...batch].sort((a, b) => (a.unitId < b.unitId ? -1 : a.unitId > b.unitId ? 1 : 0))
  const ms = w.flatMap((x) => x.measurements.map((m) => ({ runId: x.runId, ...m })))
  return [
    ...RUN_COLUMNS.map(([, , value]) => w.map(value)),
    ...MEASUREMENT_COLUMNS.map(([, , value]) => ms.map(value)),
  ]
}
