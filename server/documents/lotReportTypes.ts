import type { RateInterval } from '../../shared/quality/poisson'
import type { Capability, RuleViolation } from '../../shared/quality/spc'
import type { TurnVerdict } from '../../shared/quality/turnReview'
import type { LotStatus } from '../../shared/lots'
import type { NonconformanceDto } from '../../shared/schemas/lots'
import type { LotYieldDto } from '../../shared/schemas/yield'
import type { CheckSeriesDto } from '../../shared/schemas/statistics'

// Everything the lot report PDF shows. The documents service gathers it (lotReportData.ts) so
// the renderer stays a pure function of this data (and so the tests can compare the PDF's text
// with these figures).

/** A bar of the defect-code Pareto: nonconformances opened with this code. */
export interface ParetoBar {
  code: string
  description: string
  count: number
}

/** Capability of one numeric check over every recorded value of it in the lot. */
export interface CheckCapability extends Capability {
  stepName: string
  key: string
  label: string
  unit: string | null
  lower: number | null
  upper: number | null
  decimals: number
}

/** One unit's turn deviation at one winding run, in build order. */
export interface TurnPoint {
  serial: string
  station: string
  operator: string
  finishedAt: string
  /** Turns the reading implies: ratio, N_p·V_s/V_p; median, N_nom·√(L / L_median). */
  estimatedTurns: number
  deviation: number
  /** Suspected miscount by this series' signal, exactly as the Yield board flags the run. */
  miscount: boolean
}

/**
 * A turn-deviation series of one winding, by one signal, with its individuals chart: a view of
 * one winding of `lotTurnDeviation()` (the Yield board's computation), never computed here.
 */
export interface TurnSeries {
  winding: string
  nominalTurns: number
  /** ratio: from the voltage-ratio test (precise); median: inductance against the lot median. */
  method: 'ratio' | 'median'
  /** Lot median inductance / AL·N² − 1, in % (median method; null without enough readings). */
  lotOffsetPercent: number | null
  points: TurnPoint[]
  /** Centred on zero; null limits with fewer than 2 points or no spread. */
  chart: { center: number; ucl: number | null; lcl: number | null } | null
  /** Run-rule violations, indexing `points`. */
  violations: RuleViolation[]
  /** The winding's verdict and sentence from the board; on the winding's first series only. */
  verdict: { value: TurnVerdict; summary: string } | null
}

/** The lot report's data: the lot, its yield figures, charts' series and tables. */
export interface LotReportData {
  lot: {
    number: string
    status: LotStatus
    quantity: number
    orderRef: string
    customerName: string
    dueDate: string | null
    releasedAt: Date | null
    closedAt: Date | null
    createdAt: Date
  }
  product: { code: string; name: string }
  revision: { letter: string }
  /** The latest step run or nonconformance decision the figures include (or the release). */
  asOf: Date
  yield: LotYieldDto
  dpu: { value: number | null; interval: RateInterval; defects: number }
  pareto: ParetoBar[]
  turnSeries: TurnSeries[]
  capability: CheckCapability[]
  /** The checks the engineer marked as key, each with its I-MR chart and capability. */
  keyChecks: CheckSeriesDto[]
  nonconformances: NonconformanceDto[]
}
