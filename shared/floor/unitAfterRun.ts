import type { UnitState } from '../lots'
import type { StepRefDto } from '../schemas/lots'

/** Why a unit is on hold: its own nonconformance, its lot's hold, or a containment. */
export type UnitHoldKind = 'nonconformance' | 'lot' | 'containment' | null

/** The fields of a unit that a step run decides. */
export interface UnitMove {
  state: UnitState
  currentStepId: string | null
  reworkUntilPosition: number | null
  finishedAt: Date | null
  holdKind: UnitHoldKind
  heldFromState: UnitState | null
  holdReason: string
}

/** The unit as a step run reads it to decide where it goes. */
export type UnitBeforeRun = Omit<UnitMove, 'state'> & { state: UnitState }

/**
 * Where a unit goes after a step run. A pass goes to the next step (or ends the route as
 * passed) and ends a rework once the failed step is passed again; a fail holds the unit for
 * the lead, who disposes the nonconformance it opens. The scan writes the move in its batched
 * statement (`moved` in WRITE_RUNS, server/services/floor/stepRunSql.ts).
 */
export function unitAfterRun(
  unit: UnitBeforeRun,
  step: { name: string; position: number; next: StepRefDto | null },
  failedKeys: readonly string[],
  at: Date,
): UnitMove {
  const kept = {
    currentStepId: unit.currentStepId,
    reworkUntilPosition: unit.reworkUntilPosition,
    finishedAt: unit.finishedAt,
    holdKind: unit.holdKind,
    heldFromState: unit.heldFromState,
    holdReason: unit.holdReason,
  }
  if (failedKeys.length > 0)
    return {
      ...kept,
      state: 'on_hold',
      holdKind: 'nonconformance',
      heldFromState: unit.state,
      holdReason: `failed ${step.name} (${failedKeys.join(', ')})`,
    }
  const next = step.next
  const isReworkDone =
    unit.state === 'in_rework' && (unit.reworkUntilPosition ?? 0) <= step.position
  const state: UnitState = !next
    ? 'passed'
    : unit.state === 'in_rework' && !isReworkDone
      ? 'in_rework'
      : 'in_progress'
  return {
    ...kept,
    state,
    currentStepId: next?.id ?? null,
    reworkUntilPosition: state === 'in_rework' ? unit.reworkUntilPosition : null,
    finishedAt: next ? null : at,
  }
}
