import { z } from 'zod'
import { isoDate, text } from './common'
import type { ProportionInterval } from '../quality/proportion'
import type { Capability, RuleViolation } from '../quality/spc'
import type { TurnVerdict } from '../quality/turnReview'
import type { SeriesJudgement } from '../quality/episodes'
import type { StationKind } from '../stations'

// The board's filter form sends an empty field for "all"; treat it as left out.
const optionalId = z.preprocess(
  (v) => (v === '' ? undefined : v),
  text().uuid('not a valid id').optional(),
)

/** Columns the board's lots table sorts by, on the server. */
export const YIELD_SORT_KEYS = [
  'number',
  'started',
  'lotFpy',
  'finalYield',
  'rty',
  'wip',
  'fieldReturns',
] as const
export type YieldSortKey = (typeof YIELD_SORT_KEYS)[number]

const blankToUndefined = (v: unknown) => (v === '' ? undefined : v)

/** The Yield board's period and filters; `from` and `to` are whole UTC days, both included. */
export const YieldSummaryQuery = z
  .object({
    from: isoDate,
    to: isoDate,
    productId: optionalId,
    revisionId: optionalId,
    /** Lots table order; newest lot first when left out. Nulls (no figure yet) sort last. */
    sort: z.preprocess(blankToUndefined, z.enum(YIELD_SORT_KEYS).optional()),
    dir: z.preprocess(blankToUndefined, z.enum(['asc', 'desc']).default('desc')),
  })
  .refine((q) => q.from <= q.to, { message: 'the period ends before it starts', path: ['to'] })
export type YieldSummaryQuery = z.infer<typeof YieldSummaryQuery>

/** A ratio with its 95 % Wilson interval; `value` is null when the denominator is 0. */
export interface RatioDto {
  value: number | null
  interval: ProportionInterval
}

/** First-pass yield at one route step of a lot (DESIGN.md §7). */
export interface StepYieldDto {
  stepId: string
  name: string
  position: number
  firstAttempts: number
  passedFirst: number
  /** null when no unit has made a first attempt at the step. */
  fpy: number | null
  interval: ProportionInterval
}

/** Units waiting at or working through one route step. */
export interface StepWipDto {
  stepName: string
  stationKind: StationKind
  units: number
}

/** One lot's yield figures; every ratio is null, never NaN, when its denominator is 0. */
export interface LotYieldDto {
  lotId: string
  steps: StepYieldDto[]
  /** Product of the FPYs of the steps that have first attempts; null if none has. */
  rty: number | null
  lotFpy: RatioDto
  finalYield: RatioDto
  /** Failed step runs / units started. */
  dpu: number | null
  /** Units with at least one step run. */
  started: number
  /** Units passed, shipped, returned or scrapped. */
  finished: number
  /** Units passed, shipped or returned. */
  passed: number
  scrapped: number
  wip: StepWipDto[]
}

/** A row of the board's lots table: the lot's figures over its whole history. */
export interface YieldLotRowDto {
  lotId: string
  number: string
  productCode: string
  revisionLetter: string
  started: number
  finished: number
  lotFpy: number | null
  finalYield: number | null
  rty: number | null
  /** Units still on the route: queued, in progress, in rework or on hold. */
  wip: number
  /** Service cases (returns) logged against the lot's units. */
  fieldReturns: number
}

/** The period's figures over every unit of the lots in the table. */
export interface YieldKpisDto {
  started: number
  finished: number
  fpy: RatioDto
  finalYield: RatioDto
  /** Pooled per revision, then weighted by units started (see `summarizeYield`). */
  rty: number | null
  dpu: number | null
}

/** The Yield board: lots with a step run in the period, and the period's KPIs. */
export interface YieldSummaryDto {
  from: string
  to: string
  lots: YieldLotRowDto[]
  kpis: YieldKpisDto
}

/** One bar of a lot's Pareto of defect codes: failed step runs carrying the code. */
export interface ParetoBarDto {
  /** null for failures recorded without a code. */
  defectCodeId: string | null
  code: string
  description: string
  count: number
  /** Running share of all failures, in order of the bars, 0–1. */
  cumulative: number
}

/** One day's first attempts at any step of the lot and how many of them failed. */
export interface DailyFailureDto {
  day: string
  firstAttempts: number
  failed: number
  p: number
  ucl: number
  lcl: number
}

/** The p-chart of a lot's daily first-pass failure fraction, limits per day's sample size. */
export interface LotDailyFailuresDto {
  lotId: string
  center: number | null
  days: DailyFailureDto[]
}

/** Units of a lot waiting at or being worked at each station (by the station of the step). */
export interface StationWipDto {
  stepName: string
  stationKind: StationKind
  /** Station codes where the step's runs were recorded, for the label. */
  stationCodes: string[]
  units: number
}

/** A lot's Pareto, WIP per station and daily failure p-chart, for the board's lot detail. */
export interface LotYieldDetailDto {
  lotId: string
  pareto: ParetoBarDto[]
  wip: StationWipDto[]
  daily: LotDailyFailuresDto
}

/** One winding run of one unit, with its turn estimates, in build order. */
export interface TurnRunDto {
  stepRunId: string
  serial: string
  attempt: number
  finishedAt: string
  stationCode: string
  operatorName: string
  /** Measured inductance in the inductance check's unit; null without one. */
  inductance: number | null
  /** N_s = N_p · V_s / V_p (precise). */
  turnsFromRatio: number | null
  ratioDeviation: number | null
  /** √(L / AL) with the nominal AL (coarse: carries the AL tolerance). */
  turnsFromInductance: number | null
  inductanceDeviation: number | null
  /** L / lot median L − 1, in %. */
  offMedianPercent: number | null
  /** N_nom·√(L / L_median) − N_nom: this unit's turns against the lot's own cores. */
  medianDeviation: number | null
  isSuspect: boolean
  /** Which signal flagged it: the ratio test, the lot median inductance, or both. */
  suspectBy: ('ratio' | 'median')[]
}

/** Turn-deviation figures of the runs at one bench or by one operator (SQL aggregates). */
export interface TurnGroupDto {
  /** Station code or operator name. */
  label: string
  runs: number
  suspects: number
  meanRatioDeviation: number | null
  meanMedianDeviation: number | null
}

/** An individuals chart of a deviation in build order, centred on zero. */
export interface TurnChartDto {
  /** Which deviation: from the ratio test, or from the lot median inductance. */
  basis: 'ratio' | 'median'
  values: { index: number; serial: string; value: number }[]
  center: number
  sigma: number | null
  ucl: number | null
  lcl: number | null
  violations: RuleViolation[]
  /** Whether the run rules could judge the series: enough points and some spread. */
  judgement: SeriesJudgement
  /** "not enough variation to judge" when they could not, else null. */
  judgementText: string | null
}

/** Histogram bar: deviations (turns) in [from, to) from the ratio test and from inductance. */
export interface TurnHistogramBinDto {
  from: number
  to: number
  ratio: number
  inductance: number
}

/** The turn-count review of one winding of a lot's revision. */
export interface WindingTurnsDto {
  windingId: string
  name: string
  nominalTurns: number
  alNanoHenry: number
  alTolerancePercent: number
  inductanceCheck: {
    key: string
    label: string
    unit: string
    lower: number | null
    upper: number | null
  } | null
  ratioCheckKey: string | null
  runs: TurnRunDto[]
  histogram: TurnHistogramBinDto[]
  ratioChart: TurnChartDto | null
  medianChart: TurnChartDto | null
  /** Capability of the inductance (its unit) against the check's limits, in build order. */
  capability: Capability | null
  /** AL·N² in the inductance check's unit. */
  nominalInductance: number | null
  lotMedianInductance: number | null
  /** Lot median / nominal − 1, in %. */
  lotOffsetPercent: number | null
  suspects: number
  verdict: TurnVerdict
  /** The verdict in a sentence for the lead, naming the bench where the suspects were wound. */
  summary: string
  byStation: TurnGroupDto[]
  byOperator: TurnGroupDto[]
}

/** Turn-count deviation of every winding with magnetics data and linked checks. */
export interface LotTurnDeviationDto {
  lotId: string
  lotNumber: string
  productCode: string
  revisionLetter: string
  windings: WindingTurnsDto[]
}
