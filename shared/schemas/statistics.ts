import { z } from 'zod'
import { isoDate, text } from './common'
import type { SeriesStatistics } from '../quality/spcSeries'
import type { Unit } from '../units'

// Statistics on any numeric check (issue 20 point 4): for one lot, or for a product's check
// (by key, across its lots and revisions) on the Yield board.

const blankToUndefined = (v: unknown) => (v === '' ? undefined : v)
const optionalId = z.preprocess(blankToUndefined, text().uuid('not a valid id').optional())
const checkKey = z.preprocess(
  blankToUndefined,
  text()
    .regex(/^[a-z][a-z0-9_]{0,39}$/, 'not a check key')
    .optional(),
)

/** One lot's statistics; `checkId` picks the check whose series to return. */
export const LotStatisticsQuery = z.object({ checkId: optionalId })
export type LotStatisticsQuery = z.infer<typeof LotStatisticsQuery>

/** A product's check across lots in a period (whole UTC days, both included). */
export const ProductStatisticsQuery = z
  .object({
    productId: text().uuid('choose a product'),
    revisionId: optionalId,
    from: isoDate,
    to: isoDate,
    checkKey,
  })
  .refine((q) => q.from <= q.to, { message: 'the period ends before it starts', path: ['to'] })
export type ProductStatisticsQuery = z.infer<typeof ProductStatisticsQuery>

/** A numeric check the picker offers, with how many readings it has in the scope. */
export interface StatisticsCheckDto {
  /** The check's id (lot scope) or its key (product scope): what the query takes back. */
  ref: string
  key: string
  label: string
  stepName: string
  stepPosition: number
  unit: Unit | null
  readings: number
}

/** One reading in scan order. */
export interface SeriesPointDto {
  index: number
  serial: string
  lotNumber: string
  attempt: number
  finishedAt: string
  value: number
}

/** The series of one check with its I-MR chart, run rules and capability. */
export interface CheckSeriesDto {
  check: Omit<StatisticsCheckDto, 'readings'> & {
    lower: number | null
    upper: number | null
    nominal: number | null
    decimals: number
  }
  /** Across lots: the revision whose limits are used (the newest with readings). */
  limitsFrom: string | null
  points: SeriesPointDto[]
  /** True when only the latest STATISTICS_MAX_POINTS readings are kept. */
  isCut: boolean
  statistics: SeriesStatistics
}

/** What the statistics panel shows: the checks to pick from and the picked one's series. */
export interface StatisticsDto {
  checks: StatisticsCheckDto[]
  selected: CheckSeriesDto | null
}

/** Most readings one series returns: the latest ones, in scan order (our choice, no source). */
export const STATISTICS_MAX_POINTS = 2000
