import { countersignRefusal } from '../countersign'
import type { CountersignRead } from '../countersign'
import { codeFromScan } from '../links'
import { evaluateChecks, overallVerdict } from '../recipes/evaluate'
import type { CheckResult, CheckValue, Verdict } from '../recipes/evaluate'
import type { Role } from '../roles'
import type { StepRefDto, StepRunInput, UnitSummaryDto } from '../schemas/lots'
import type { BomLineDto, CheckDto, WindingDto } from '../schemas/recipes'
import type { StationKind } from '../stations'
import { componentLotRefusal } from './componentLotRefusal'
import type { LotToFit } from './componentLotRefusal'
import { routeRefusal } from './routeRules'
import type { RouteLot, RouteStation } from './routeRules'
import { typedValueFields } from './typedValues'
import { unitAfterRun } from './unitAfterRun'
import type { UnitBeforeRun, UnitMove } from './unitAfterRun'

/** Who may be the second person on a step that needs a countersign. */
export const STEP_COUNTERSIGN_ROLES: readonly Role[] = ['operator', 'lead', 'engineer']

/** The released step a unit stands at, with what its scan needs: checks, windings, parts. */
export interface StepToDo {
  id: string
  name: string
  stationKind: StationKind
  position: number
  requiresSignoff: boolean
  checks: readonly CheckDto[]
  windings: readonly WindingDto[]
  /** The bill-of-materials lines fitted at this step. */
  bom: readonly Pick<BomLineDto, 'id' | 'partId' | 'partNumber' | 'quantity' | 'traceLevel'>[]
  next: StepRefDto | null
}

/** The unit as the scan read it. */
export interface UnitAsRead extends UnitBeforeRun {
  serial: string
  reworkCount: number
  /** Runs already recorded at its current step; this one is attempt `runsAtStep + 1`. */
  runsAtStep: number
}

/** A part serial already fitted, and the unit it is in. */
export interface FittedSerial {
  partId: string
  itemSerial: string
  unitSerial: string
}

/** Everything a scan is decided on, read before anything is written. */
export interface ScanFacts {
  unit: UnitAsRead
  lot: RouteLot
  /** Null when the scanned station code names no station. */
  station: RouteStation | null
  /** The plan of the unit's current step; null when it has none. */
  step: StepToDo | null
  submission: Pick<StepRunInput, 'stationCode' | 'values' | 'consumptions' | 'defectCodeId'>
  /** Whether the submission's defect code exists (true when it names none). */
  isDefectCodeKnown: boolean
  /** The component lots the scanned codes name; a code not found here is refused. */
  componentLots: readonly LotToFit[]
  /**
   * Part serials among the scanned ones that are already fitted to a unit (whichever lot they
   * came from): a serial-traced part's serial goes into one unit only.
   */
  fittedSerials?: readonly FittedSerial[]
  /** The countersign as read (signer and password check), or null when none was typed. */
  countersign: CountersignRead | null
  actor: { id: string | null; email: string | null }
  /** When the run happens: the unit's finish time, a lot's expiry day. */
  at: Date
}

/** A scan that may not be recorded, with the operator's words and the HTTP status to answer. */
export interface StepRunRefusal {
  /** 400 the submission is incomplete or wrong; 404 it names no such station; 409 not now. */
  status: 400 | 404 | 409
  /** The API error code. */
  code: string
  message: string
  /** Field name to message, for the Floor form. */
  fields?: Record<string, string>
  /** A wrong countersign e-mail or password: the server audits it like a failed sign-in. */
  isCountersignFailure?: boolean
}

/** A component lot fitted on a line by the run. */
export interface FittedLot {
  bomLineId: string
  componentLotId: string
  /** The fitted item's serial on a serial-traced line, upper case; null on a lot-traced one. */
  itemSerial: string | null
}

/** Each check judged and the run's overall outcome. */
export interface StepRunJudgement {
  /** Each check's value (derived ones computed) and verdict, by key. */
  results: Record<string, CheckResult>
  /** The one overall verdict: fail when any check fails, missing when any is unfilled. */
  verdict: Verdict
  /** What the run records: anything short of a pass fails (so does a derived value that cannot be computed). */
  result: 'pass' | 'fail'
  /** The keys of the checks that did not pass, in check order. */
  failedKeys: string[]
}

/** What a recorded scan does. */
export interface StepRunDecision extends StepRunJudgement {
  attempt: number
  isRework: boolean
  /** The unit's fields after the run. */
  move: UnitMove
  /** The unit as the Floor shows it after the run. */
  unit: UnitSummaryDto
  /** The nonconformance a fail opens. */
  nonconformance: { defectCodeId: string; failedChecks: string[] } | null
  fitted: FittedLot[]
  countersignedBy: { id: string; email: string } | null
  /** The audit row's `after`. */
  audit: Record<string, unknown>
}

export type StepRunOutcome = { refusal: StepRunRefusal } | { decision: StepRunDecision }

const badInput = (message: string, fields: Record<string, string>): StepRunRefusal => ({
  status: 400,
  code: 'validation_failed',
  message,
  fields,
})

/**
 * Judges a step's checks on typed values: derived values computed, each verdict, the overall
 * verdict and the run's result. The Floor shows this as the operator types, the bench import's
 * dry run shows it per row, and the scan records it.
 */
export function judgeStepRun(
  step: Pick<StepToDo, 'checks' | 'windings'>,
  values: Readonly<Record<string, CheckValue>>,
): StepRunJudgement {
  const results = evaluateChecks(step.checks, values, step.windings)
  const verdict = overallVerdict(results)
  const failedKeys = step.checks.filter((c) => results[c.key]?.verdict !== 'pass').map((c) => c.key)
  return { results, verdict, result: verdict === 'pass' ? 'pass' : 'fail', failedKeys }
}

/** The lots to fit on the step's lines, or why the scanned ones may not be (first line first). */
function fitLots(facts: ScanFacts, step: StepToDo): FittedLot[] | StepRunRefusal {
  const today = facts.at.toISOString().slice(0, 10)
  const fitted: FittedLot[] = []
  const partOf = new Map<string, string>() // component lot id -> part id, of the lots fitted
  for (const line of step.bom) {
    const field = `consumptions.${line.id}`
    const scan = facts.submission.consumptions.find((s) => s.bomLineId === line.id)
    if (!scan)
      return badInput(`${field}: scan a lot of ${line.partNumber}`, {
        [field]: `scan a lot of ${line.partNumber}`,
      })
    const lot = facts.componentLots.find((l) => l.internalCode === codeFromScan(scan.code))
    if (!lot)
      return badInput(`${field}: no component lot ${scan.code}`, {
        [field]: `no component lot ${scan.code}`,
      })
    const refusal = componentLotRefusal(lot, line, line.quantity, today)
    if (refusal)
      return {
        status: 409,
        code: 'component_lot_refused',
        message: refusal,
        fields: { [field]: refusal },
      }
    const itemSerial = scan.itemSerial?.trim().toUpperCase() || null
    const isSerialTraced = line.traceLevel === 'serial'
    if (isSerialTraced && !itemSerial)
      return badInput(`${field}: scan the serial of the ${line.partNumber} fitted`, {
        [field]: 'scan the item’s serial',
      })
    if (isSerialTraced && itemSerial) {
      const isTwice = fitted.some(
        (f) => f.itemSerial === itemSerial && partOf.get(f.componentLotId) === lot.partId,
      )
      const elsewhere = facts.fittedSerials?.find(
        (f) => f.partId === lot.partId && f.itemSerial === itemSerial,
      )
      const holder = isTwice
        ? 'another line of this run'
        : elsewhere && `unit ${elsewhere.unitSerial}`
      if (holder)
        return {
          status: 409,
          code: 'item_serial_used',
          message: `${line.partNumber} serial ${itemSerial} is already fitted to ${holder}`,
          fields: { [field]: `already fitted to ${holder}` },
        }
    }
    partOf.set(lot.id, lot.partId)
    fitted.push({
      bomLineId: line.id,
      componentLotId: lot.id,
      itemSerial: isSerialTraced ? itemSerial : null,
    })
  }
  return fitted
}

/**
 * Decides a scan from what was read: either why it may not be recorded, or the run it records
 * (each check's verdict and derived value, the result, the attempt, the unit's move, the
 * nonconformance a fail opens, the lots fitted, the second signature). Refusals come in the
 * order the operator should hear them: the station, the route rules, the typed values, the
 * defect code, the component lots line by line, the countersign. Pure: the caller reads
 * everything first and writes the decision after.
 */
export function decideStepRun(facts: ScanFacts): StepRunOutcome {
  const { unit, station, step, submission } = facts
  if (!station)
    return {
      refusal: {
        status: 404,
        code: 'not_found',
        message: `station ${submission.stationCode} not found`,
      },
    }
  const route = routeRefusal(unit, facts.lot, step, station)
  if (route || !step)
    return {
      refusal: {
        status: 409,
        code: route?.code ?? 'no_step',
        message: route?.message ?? `${unit.serial} has no step to do`,
      },
    }
  const typed = typedValueFields(step.checks, submission.values)
  const [first] = Object.entries(typed)
  if (first) return { refusal: badInput(`${first[0]}: ${first[1]}`, typed) }
  const judged = judgeStepRun(step, submission.values)
  if (judged.result === 'fail' && !submission.defectCodeId)
    return {
      refusal: badInput('defectCodeId: choose a defect code for the failed check', {
        defectCodeId: 'choose a defect code',
      }),
    }
  if (!facts.isDefectCodeKnown)
    return {
      refusal: badInput('defectCodeId: no such defect code', {
        defectCodeId: 'no such defect code',
      }),
    }
  const fitted = fitLots(facts, step)
  if (!Array.isArray(fitted)) return { refusal: fitted }
  let countersignedBy: StepRunDecision['countersignedBy'] = null
  if (step.requiresSignoff) {
    const sign = countersignRefusal(
      facts.countersign,
      facts.actor.id,
      STEP_COUNTERSIGN_ROLES,
      step.name,
    )
    if (sign)
      return {
        refusal: {
          ...badInput(sign.message, { countersign: sign.field }),
          code: sign.code,
          isCountersignFailure: sign.isWrongCredentials,
        },
      }
    const { id, email } = facts.countersign!.user!
    countersignedBy = { id, email }
  }
  const attempt = unit.runsAtStep + 1
  const move = unitAfterRun(unit, step, judged.failedKeys, facts.at)
  const here = {
    id: step.id,
    name: step.name,
    stationKind: step.stationKind,
    position: step.position,
  }
  return {
    decision: {
      ...judged,
      attempt,
      isRework: unit.state === 'in_rework',
      move,
      unit: {
        serial: unit.serial,
        state: move.state,
        currentStep: judged.result === 'pass' ? step.next : here,
        reworkCount: unit.reworkCount,
      },
      nonconformance:
        judged.result === 'fail'
          ? { defectCodeId: submission.defectCodeId!, failedChecks: judged.failedKeys }
          : null,
      fitted,
      countersignedBy,
      audit: {
        serial: unit.serial,
        step: step.name,
        result: judged.result,
        attempt,
        station: station.code,
        countersignedBy: countersignedBy?.email ?? null,
      },
    },
  }
}
