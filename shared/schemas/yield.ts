import { z } from 'zod'
import type { ProportionInterval } from '../quality/proportion'
import type { StationKind } from '../stations'

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'use a date like 2026-12-01')
// The board's filter form sends an empty field for "all"; treat it as left out.
const optionalId = z.preprocess(
  (v) => (v === '' ? undefined : v),
  z.string().uuid('not a valid id').optional(),
)

/** The Yield board's period and filters; `from` and `to` are whole UTC days, both included. */
export const YieldSummaryQuery = z
  .object({
    from: isoDate,
    to: isoDate,
    productId: optionalId,
    revisionId: optionalId,
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
