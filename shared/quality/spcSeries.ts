// Everything the statistics panel and the lot report show of one numeric check's series
// (issue 20 point 4): the individuals and moving-range chart, its run-rule hits, and Cp/Cpk with
// their confidence intervals. Pure; the server reads the series in scan order and calls this.
import { NOT_ENOUGH_VARIATION, seriesBasis, type SeriesJudgement } from './episodes'
import { capability, individualsChart, runRuleViolations } from './spc'
import type { Capability, IndividualsChart, RuleViolation, SpecLimits } from './spc'
import { cpInterval, cpkInterval, type IndexInterval } from './spcIntervals'

/** The confidence of the capability intervals. */
export const CAPABILITY_CONFIDENCE = 0.95

/** The statistics of one check's series in scan order. */
export interface SeriesStatistics {
  n: number
  /** Whether the series could be judged: RUN_RULE_MIN_POINTS values or more, and some spread. */
  judgement: SeriesJudgement
  /** "not enough variation to judge" when it could not, else null. */
  judgementText: string | null
  /** Moving ranges: element j is |x₍ⱼ₊₁₎ − xⱼ|, drawn at value index j + 1. */
  movingRanges: number[]
  /** I-MR limits; null when not judged. */
  chart: IndividualsChart | null
  /** Western Electric rules 1–4 on the individuals, against the chart's centre and σ. */
  violations: RuleViolation[]
  /** Value indexes (1 or more) whose moving range is above the MR chart's upper limit. */
  mrAbove: number[]
  /** Mean, sigmas and indices; the indices only when judged. */
  capability: Capability
  cpInterval: IndexInterval | null
  cpkInterval: IndexInterval | null
}

/**
 * I-MR chart (X at mean ± 3·MR̄/d2, MR up to D4·MR̄), run rules and capability of a series in
 * scan order. A series too short or without spread keeps its points and mean and says
 * NOT_ENOUGH_VARIATION: no limits, rules or indices are drawn from it.
 */
export function seriesStatistics(
  values: readonly number[],
  limits: SpecLimits = {},
): SeriesStatistics {
  const movingRanges = values.slice(1).map((v, i) => Math.abs(v - values[i]!))
  const full = capability(values, limits)
  const judgement = seriesBasis(values, null).judgement
  if (judgement !== 'judged')
    return {
      n: values.length,
      judgement,
      judgementText: NOT_ENOUGH_VARIATION,
      movingRanges,
      chart: null,
      violations: [],
      mrAbove: [],
      capability: { ...full, cp: null, cpk: null, pp: null, ppk: null },
      cpInterval: null,
      cpkInterval: null,
    }
  const chart = individualsChart(values)
  const sigma = (chart.ucl - chart.center) / 3
  return {
    n: values.length,
    judgement,
    judgementText: null,
    movingRanges,
    chart,
    violations: runRuleViolations(values, chart.center, sigma),
    mrAbove: movingRanges.flatMap((r, i) => (r > chart.mrUcl ? [i + 1] : [])),
    capability: full,
    cpInterval: full.cp === null ? null : cpInterval(full.cp, values.length, CAPABILITY_CONFIDENCE),
    cpkInterval:
      full.cpk === null ? null : cpkInterval(full.cpk, values.length, CAPABILITY_CONFIDENCE),
  }
}
