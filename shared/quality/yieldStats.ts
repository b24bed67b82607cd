// Per-lot yield figures (DESIGN.md §7) from a lot's step runs and its units' states.
import { FINISHED_UNIT_STATES, PASSED_UNIT_STATES, type UnitState } from '../lots'
import { wilsonInterval, type ProportionInterval } from './proportion'

/** One recorded run of a unit through a route step; `attempt` counts from 1. */
export interface StepRun {
  unitId: string
  stepId: string
  attempt: number
  result: 'pass' | 'fail'
}

/** What `lotYield` needs: the lot's runs, its route's step ids in order, and its units. */
export interface LotYieldInput {
  runs: readonly StepRun[]
  stepIds: readonly string[]
  units: readonly { unitId: string; state: UnitState }[]
}

/** First-pass yield at one step, with its 95 % Wilson interval. */
export interface StepFpy {
  passedFirst: number
  firstAttempts: number
  /** null when no unit has made a first attempt at the step yet. */
  fpy: number | null
  interval: ProportionInterval
}

/** A lot's yield figures; each ratio is null (never NaN) when its denominator is 0. */
export interface LotYield {
  stepFpy: Record<string, StepFpy>
  /** Rolled throughput yield: product of the step FPYs of steps that have first attempts. */
  rty: number | null
  /** Finished units that passed every step at the first attempt / finished units. */
  lotFpy: number | null
  /** Passed, shipped or returned units / finished units. */
  finalYield: number | null
  /** Failed step runs (defects) / started units. */
  dpu: number | null
  /** Units whose route has ended: passed, shipped, returned or scrapped. */
  finished: number
  /** Units with at least one run. */
  started: number
}

function ratio(num: number, den: number): number | null {
  return den === 0 ? null : num / den
}

/**
 * Step FPY, RTY, lot FPY, final yield and DPU for one lot. Only steps in `stepIds` get a step FPY;
 * DPU counts every failed run. A unit is first-pass only if it ended passed, has a passing
 * first attempt at every route step, and has no failed run and no attempt after the first.
 */
export function lotYield(input: LotYieldInput): LotYield {
  for (const run of input.runs) {
    if (!Number.isInteger(run.attempt) || run.attempt < 1)
      throw new RangeError(`attempt must be a whole number from 1 (unit ${run.unitId})`)
  }

  const stepFpy: Record<string, StepFpy> = {}
  let rty: number | null = null
  for (const stepId of input.stepIds) {
    const first = input.runs.filter((r) => r.stepId === stepId && r.attempt === 1)
    const passedFirst = first.filter((r) => r.result === 'pass').length
    const fpy = ratio(passedFirst, first.length)
    stepFpy[stepId] = {
      passedFirst,
      firstAttempts: first.length,
      fpy,
      interval: wilsonInterval(passedFirst, first.length),
    }
    if (fpy !== null) rty = (rty ?? 1) * fpy
  }

  const runsByUnit = new Map<string, StepRun[]>()
  for (const run of input.runs) {
    const list = runsByUnit.get(run.unitId)
    if (list) list.push(run)
    else runsByUnit.set(run.unitId, [run])
  }
  const isFirstPass = (unitId: string): boolean => {
    const runs = runsByUnit.get(unitId) ?? []
    if (runs.some((r) => r.result === 'fail' || r.attempt > 1)) return false
    return input.stepIds.every((s) => runs.some((r) => r.stepId === s && r.result === 'pass'))
  }

  const states = new Map(input.units.map((u) => [u.unitId, u.state]))
  let finished = 0
  let passed = 0
  let firstPass = 0
  for (const [unitId, state] of states) {
    if (!FINISHED_UNIT_STATES.includes(state)) continue
    finished++
    if (!PASSED_UNIT_STATES.includes(state)) continue
    passed++
    if (isFirstPass(unitId)) firstPass++
  }

  const defects = input.runs.filter((r) => r.result === 'fail').length
  const started = runsByUnit.size
  return {
    stepFpy,
    rty,
    lotFpy: ratio(firstPass, finished),
    finalYield: ratio(passed, finished),
    dpu: ratio(defects, started),
    finished,
    started,
  }
}
