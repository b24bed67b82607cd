// From what a scan read to what it writes: the server's side of the scan's decision. The rules are
// in shared/floor/decideStepRun.ts (pure); here the facts are gathered for it, a refusal becomes
// an error (a wrong countersign audited first), and a decision becomes the write of
// stepRunSql.ts and the consumptions to apply. Both of the scan's paths (stepRuns.ts) call it.
import { randomUUID } from 'node:crypto'
import { decideStepRun } from '../../../shared/floor/decideStepRun'
import type {
  FittedSerial,
  ScanFacts,
  StepRunDecision,
  StepRunRefusal,
} from '../../../shared/floor/decideStepRun'
import type { CountersignRead } from '../../../shared/countersign'
import type { StepRunInput, StepRunResultDto } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import type { ComponentLot } from '../../models'
import type { Actor } from '../admin'
import { auditCountersignFailure } from '../auth'
import { toLotToFit } from './consumptions'
import type { PlannedConsumption } from './consumptions'
import type { StepPlan } from './stepPlans'
import type { MeasurementRow, RunWrite, ScanRow } from './stepRunSql'

/** A scan decided: what it writes, and what to answer once it is written. */
export interface Decided {
  write: RunWrite
  planned: PlannedConsumption[]
  body: StepRunResultDto
}

/** What the scan read beyond its row: the step's plan, and under the lock its lots and signer. */
export interface Extra {
  step: StepPlan | null
  componentLots: ComponentLot[]
  fittedSerials: FittedSerial[]
  countersign: CountersignRead | null
}

/** One measurement row per check of the step: its value as typed or derived, and its verdict. */
function measurementRows(step: StepPlan, decision: StepRunDecision): MeasurementRow[] {
  return step.checks.map((c) => {
    const r = decision.results[c.key]!
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

function refused(refusal: StepRunRefusal): AppError {
  return new AppError(refusal.status, refusal.code, refusal.message, refusal.fields)
}

/**
 * Decides a scan from what was read (shared/floor/decideStepRun.ts) and turns the decision into
 * the write: a refusal throws, after auditing a wrong countersign like a failed sign-in.
 */
export async function decide(
  row: ScanRow,
  extra: Extra,
  input: StepRunInput,
  actor: Actor,
  at: Date,
): Promise<Decided> {
  const { step } = extra
  const facts: ScanFacts = {
    unit: row,
    lot: {
      number: row.lotNumber,
      status: row.lotStatus,
      isOnHold: row.lotIsOnHold,
      holdReason: row.lotHoldReason,
    },
    station: row.stationId
      ? {
          code: row.stationCode,
          name: row.stationName,
          kind: row.stationKind,
          isActive: row.stationIsActive,
        }
      : null,
    step,
    submission: input,
    isDefectCodeKnown: row.isDefectCodeKnown,
    componentLots: extra.componentLots.map(toLotToFit),
    fittedSerials: extra.fittedSerials,
    countersign: extra.countersign,
    actor,
    at,
  }
  const out = decideStepRun(facts)
  if ('refusal' in out) {
    if (out.refusal.isCountersignFailure && extra.countersign && step)
      await auditCountersignFailure(extra.countersign, actor, step.name)
    throw refused(out.refusal)
  }
  const { decision } = out
  const runId = randomUUID()
  const ncId = decision.nonconformance ? randomUUID() : null
  const write: RunWrite = {
    runId,
    unitId: row.id,
    stepId: step!.id,
    stationId: row.stationId!,
    operatorId: actor.id,
    countersignedBy: decision.countersignedBy?.id ?? null,
    attempt: decision.attempt,
    isRework: decision.isRework,
    result: decision.result,
    note: input.note,
    clientEventId: input.clientEventId,
    at,
    measurements: measurementRows(step!, decision),
    move: decision.move,
    lotId: row.lotId,
    actorEmail: actor.email,
    audit: JSON.stringify(decision.audit),
    ip: actor.ip ?? null,
    requestId: actor.requestId ?? null,
    // The unit as read: the write moves it only if it is still so.
    read: { runCount: row.runCount, state: row.state, reworkCount: row.reworkCount },
    nonconformance:
      ncId && decision.nonconformance
        ? {
            id: ncId,
            defectCodeId: decision.nonconformance.defectCodeId,
            failedChecks: JSON.stringify(decision.nonconformance.failedChecks),
          }
        : null,
  }
  const planned = decision.fitted.map((f) => ({
    line: step!.bomLines.find((l) => l.id === f.bomLineId)!,
    lot: extra.componentLots.find((l) => l.id === f.componentLotId)!,
    itemSerial: f.itemSerial,
  }))
  const body: StepRunResultDto = {
    stepRun: { id: runId, result: decision.result, attempt: decision.attempt },
    unit: decision.unit,
    nonconformanceId: ncId,
  }
  return { write, planned, body }
}
