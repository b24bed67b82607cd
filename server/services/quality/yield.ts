import { wilsonInterval } from '../../../shared/quality/proportion'
import type {
  LotYieldDto,
  RatioDto,
  StepWipDto,
  StepYieldDto,
  YieldLotRowDto,
  YieldSummaryDto,
  YieldSummaryQuery,
} from '../../../shared/schemas/yield'
import { AppError } from '../../errors'
import { Lot } from '../../models'
import type { LotStepTotals, LotUnitTotals } from './yieldQueries'
import { lotFieldReturns, lotStepTotals, lotsRunInPeriod, lotUnitTotals } from './yieldQueries'

const NO_UNITS: LotUnitTotals = {
  started: 0,
  finished: 0,
  passed: 0,
  scrapped: 0,
  firstPass: 0,
  defects: 0,
  runs: 0,
  isKeptCurrent: false,
}

/** The unit totals that add up over the period's lots. */
const SUMMED = ['started', 'finished', 'passed', 'scrapped', 'firstPass', 'defects'] as const

const perUnit = (num: number, den: number) => (den === 0 ? null : num / den)

/** `num / den` with its Wilson interval; null value (never NaN) when `den` is 0. */
function ratioOf(num: number, den: number): RatioDto {
  return { value: perUnit(num, den), interval: wilsonInterval(num, den) }
}

/** Step FPYs of the steps, and their product over the steps with first attempts as RTY. */
function stepYields(steps: readonly LotStepTotals[]): {
  steps: StepYieldDto[]
  rty: number | null
} {
  let rty: number | null = null
  const out = steps.map((s) => {
    const { value, interval } = ratioOf(s.passedFirst, s.firstAttempts)
    if (value !== null) rty = (rty ?? 1) * value
    return {
      stepId: s.stepId,
      name: s.name,
      position: s.position,
      firstAttempts: s.firstAttempts,
      passedFirst: s.passedFirst,
      fpy: value,
      interval,
    }
  })
  return { steps: out, rty }
}

/** Units at each step now, for the lot page's WIP strip. */
function stepWip(steps: readonly LotStepTotals[]): StepWipDto[] {
  return steps.map((s) => ({ stepName: s.name, stationKind: s.stationKind, units: s.wip }))
}

/** One lot's step FPYs, RTY, lot FPY, final yield, DPU, unit counts and WIP per step. */
export async function getLotYield(lotId: string): Promise<LotYieldDto> {
  const units = await lotUnitTotals([lotId])
  const steps = await lotStepTotals([lotId], units)
  const u = units.get(lotId) ?? NO_UNITS
  const lotSteps = steps.get(lotId) ?? []
  // Every lot has a released revision with at least one step, so no step row means no such lot;
  // asked only then, which spares the common case a round trip.
  if (!lotSteps.length && !(await Lot.findByPk(lotId, { attributes: ['id'] })))
    throw AppError.notFound(`lot ${lotId}`)
  return {
    lotId,
    ...stepYields(lotSteps),
    lotFpy: ratioOf(u.firstPass, u.finished),
    finalYield: ratioOf(u.passed, u.finished),
    dpu: perUnit(u.defects, u.started),
    started: u.started,
    finished: u.finished,
    passed: u.passed,
    scrapped: u.scrapped,
    wip: stepWip(lotSteps),
  }
}

/**
 * Period RTY: lots of different revisions run different routes, so first attempts are pooled per
 * revision step, each revision's RTY is the product of its pooled step FPYs, and the period's is
 * their mean weighted by units started. With one revision this is simply its pooled RTY.
 */
function periodRty(steps: Map<string, LotStepTotals[]>, started: Map<string, number>) {
  const byRevision = new Map<string, { started: number; steps: Map<string, LotStepTotals> }>()
  for (const [lotId, lotSteps] of steps) {
    for (const s of lotSteps) {
      const rev = byRevision.get(s.revisionId) ?? { started: 0, steps: new Map() }
      byRevision.set(s.revisionId, rev)
      const pooled = rev.steps.get(s.stepId)
      if (pooled) {
        pooled.firstAttempts += s.firstAttempts
        pooled.passedFirst += s.passedFirst
      } else rev.steps.set(s.stepId, { ...s })
    }
    const first = lotSteps[0]
    if (first) byRevision.get(first.revisionId)!.started += started.get(lotId) ?? 0
  }
  let weighted = 0
  let weight = 0
  for (const rev of byRevision.values()) {
    const { rty } = stepYields([...rev.steps.values()])
    if (rty === null || rev.started === 0) continue
    weighted += rty * rev.started
    weight += rev.started
  }
  return weight === 0 ? null : weighted / weight
}

/**
 * The lots table in the asked order (one row per lot, so sorting here is cheap); a lot without
 * the figure yet sorts last either way, and ties keep the newest-first order.
 */
function sortLots(rows: YieldLotRowDto[], query: YieldSummaryQuery): YieldLotRowDto[] {
  const key = query.sort
  if (!key) return rows
  const sign = query.dir === 'asc' ? 1 : -1
  return rows
    .map((row, i) => ({ row, i }))
    .sort((a, b) => {
      const x = a.row[key]
      const y = b.row[key]
      if (x === null || y === null) return x === y ? a.i - b.i : x === null ? 1 : -1
      const diff = typeof x === 'string' ? x.localeCompare(y as string) : x - (y as number)
      return diff === 0 ? a.i - b.i : sign * diff
    })
    .map((s) => s.row)
}

/**
 * The Yield board: every lot with a step run in the period, each with its figures over its whole
 * history, and the KPIs over all those lots' units.
 */
export async function summarizeYield(query: YieldSummaryQuery): Promise<YieldSummaryDto> {
  const lots = await lotsRunInPeriod(query)
  const ids = lots.map((l) => l.lotId)
  // The unit totals first: they tell which lots' kept step figures still hold.
  const [units, returns] = await Promise.all([lotUnitTotals(ids), lotFieldReturns(ids)])
  const steps = await lotStepTotals(ids, units)
  const total = { ...NO_UNITS }
  const rows = lots.map((lot) => {
    const u = units.get(lot.lotId) ?? NO_UNITS
    for (const k of SUMMED) total[k] += u[k]
    const lotSteps = steps.get(lot.lotId) ?? []
    return {
      ...lot,
      started: u.started,
      finished: u.finished,
      lotFpy: perUnit(u.firstPass, u.finished),
      finalYield: perUnit(u.passed, u.finished),
      rty: stepYields(lotSteps).rty,
      wip: lotSteps.reduce((n, s) => n + s.wip, 0),
      fieldReturns: returns.get(lot.lotId) ?? 0,
    }
  })
  const started = new Map(lots.map((l) => [l.lotId, units.get(l.lotId)?.started ?? 0]))
  return {
    from: query.from,
    to: query.to,
    lots: sortLots(rows, query),
    kpis: {
      started: total.started,
      finished: total.finished,
      fpy: ratioOf(total.firstPass, total.finished),
      finalYield: ratioOf(total.passed, total.finished),
      rty: periodRty(steps, started),
      dpu: perUnit(total.defects, total.started),
    },
  }
}
