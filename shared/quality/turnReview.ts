// Reading a lot's winding measurements for miscounts (DESIGN.md §7). The voltage-ratio test is
// the precise turn count; the inductance estimate carries the core's AL tolerance (ungapped
// ferrite: often ±25 %), so it is read against the lot's own median as well as the nominal.

import { individualsChart, runRuleViolations } from './spc'

export { median } from './spc'
import type { RuleViolation } from './spc'
import { NOT_ENOUGH_VARIATION } from './episodes'
import type { SeriesJudgement } from './episodes'

/**
 * A unit's inductance this many turns or more away from what the lot's median implies is a
 * suspected miscount. Coarse on purpose: cores of one lot still differ by a percent or two,
 * which is about half a turn on a 92-turn winding. Common practice, no source.
 */
export const MEDIAN_SUSPECT_TURNS = 1.5

/**
 * Fewer inductance readings than this and the lot's median says little about its cores: no
 * unit is judged against it and no core-lot offset is claimed. Common practice, no source.
 */
export const MEDIAN_MIN_RUNS = 5

/**
 * Turns a unit's inductance implies relative to the lot median, minus the nominal:
 * N_nom·√(L / L_median) − N_nom. The median core stands in for the lot's AL, so a lot-wide AL
 * offset cancels and what is left is this unit's own winding.
 */
export function turnsOffMedian(nominalTurns: number, inductance: number, medianL: number): number {
  if (!(inductance > 0) || !(medianL > 0)) throw new RangeError('inductances must be positive')
  return nominalTurns * Math.sqrt(inductance / medianL) - nominalTurns
}

/** Whether a precise (ratio) turn estimate rounds to another whole number than the nominal. */
export function isRatioMiscount(turnsFromRatio: number, nominalTurns: number): boolean {
  return Math.round(turnsFromRatio) !== Math.round(nominalTurns)
}

/** One bar of a histogram: [from, to) and how many of each series fall in it. */
export interface HistogramBin {
  from: number
  to: number
  counts: number[]
}

/**
 * Shared bins of `width` for several series, from the lowest to the highest value of any of
 * them, with bin edges on multiples of `width` offset by half a width so whole numbers sit in
 * the middle of a bar. Empty when every series is empty.
 */
export function histogram(series: readonly (readonly number[])[], width: number): HistogramBin[] {
  if (!(width > 0)) throw new RangeError('bin width must be positive')
  const all = series.flat()
  if (!all.length) return []
  const edge = (v: number) => Math.floor(v / width + 0.5)
  const first = edge(Math.min(...all))
  const last = edge(Math.max(...all))
  const bins: HistogramBin[] = []
  for (let k = first; k <= last; k++)
    bins.push({ from: (k - 0.5) * width, to: (k + 0.5) * width, counts: series.map(() => 0) })
  series.forEach((values, i) => {
    for (const v of values) bins[edge(v) - first]!.counts[i]! += 1
  })
  return bins
}

/** An individuals chart of a deviation whose target is known (zero), with its violations. */
export interface DeviationChart {
  /** Zero: the nominal (or the lot median) is the target. */
  center: number
  /** σ estimated from the average moving range / d2 (1.128). */
  sigma: number | null
  ucl: number | null
  lcl: number | null
  violations: RuleViolation[]
  /** Whether the run rules could judge the series: enough points and some spread. */
  judgement: SeriesJudgement
  /** "not enough variation to judge" when they could not, else null. */
  judgementText: string | null
}

/**
 * Individuals chart of deviations in build order, centred on zero (the target is known, so a
 * run of miscounts does not drag the centre line towards itself and flag the good units by
 * rule 4), with σ from the moving range and Western Electric rules 1–4. Null limits and no
 * violations when there are fewer than 2 values or no spread, and the chart says it cannot
 * judge. (The alerts wait for RUN_RULE_MIN_POINTS values before they e-mail anyone; the chart
 * marks what the rules see from 2 values on.)
 */
export function deviationChart(values: readonly number[]): DeviationChart {
  const unjudged = (judgement: SeriesJudgement): DeviationChart => ({
    center: 0,
    sigma: null,
    ucl: null,
    lcl: null,
    violations: [],
    judgement,
    judgementText: NOT_ENOUGH_VARIATION,
  })
  if (values.length < 2) return unjudged('too_few_points')
  const chart = individualsChart(values)
  const sigma = (chart.ucl - chart.center) / 3
  if (!(sigma > 0) || values.every((v) => v === values[0])) return unjudged('no_spread')
  return {
    center: 0,
    sigma,
    ucl: 3 * sigma,
    lcl: -3 * sigma,
    violations: runRuleViolations(values, 0, sigma),
    judgement: 'judged',
    judgementText: null,
  }
}

/** What a winding's figures look like, in the shop's terms. */
export type TurnVerdict = 'no_data' | 'in_line' | 'core_lot' | 'miscount' | 'core_lot_and_miscount'

/**
 * A lot-wide inductance offset is a core lot when the lot median implies MEDIAN_SUSPECT_TURNS or
 * more away from the nominal turns; single units off the median or off the ratio are miscounts.
 */
export function turnVerdict(input: {
  runs: number
  suspects: number
  nominalTurns: number
  /** Lot median inductance / nominal inductance (AL·N²); null without enough inductance data. */
  medianToNominal: number | null
}): TurnVerdict {
  if (input.runs === 0) return 'no_data'
  const n = input.nominalTurns
  const coreLot =
    input.medianToNominal !== null &&
    Math.abs(n * Math.sqrt(input.medianToNominal) - n) >= MEDIAN_SUSPECT_TURNS
  if (coreLot) return input.suspects > 0 ? 'core_lot_and_miscount' : 'core_lot'
  return input.suspects > 0 ? 'miscount' : 'in_line'
}
