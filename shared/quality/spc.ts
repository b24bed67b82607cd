// Statistical process control (DESIGN.md §7): capability indices and Shewhart chart limits.
// Chart constants and run rules live in their own files and are re-exported from here.
import { controlChartConstants } from './chartConstants'

export { controlChartConstants, type ChartConstants } from './chartConstants'
export { runRuleViolations, type RuleViolation } from './runRules'

/** Median of a list; null for an empty one. */
export function median(values: readonly number[]): number | null {
  if (!values.length) return null
  const s = [...values].sort((a, b) => a - b)
  const mid = Math.floor(s.length / 2)
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2
}

/** Specification limits; either may be missing for a one-sided characteristic. */
export interface SpecLimits {
  lower?: number
  upper?: number
}

/** Capability indices for one sigma: Cp (needs both limits) and Cpk (one-sided if need be). */
export interface CapabilityIndices {
  cp: number | null
  cpk: number | null
}

/** Capability of a series; a figure that cannot be computed is null, never NaN or Infinity. */
export interface Capability {
  n: number
  mean: number | null
  /** Sample standard deviation (n − 1), used for Pp and Ppk. */
  sdOverall: number | null
  /** Average moving range / d2 (1.128), used for Cp and Cpk. */
  sdWithin: number | null
  cp: number | null
  cpk: number | null
  pp: number | null
  ppk: number | null
}

function finiteValues(values: readonly number[]): void {
  if (!values.every(Number.isFinite)) throw new RangeError('values must be finite numbers')
}

function mean(values: readonly number[]): number {
  const first = values.reduce((s, v) => s + v, 0) / values.length
  // Second pass: adds back what rounding lost in the first sum.
  return first + values.reduce((s, v) => s + (v - first), 0) / values.length
}

/** Sample sd from deviations about the mean (two-pass), so large offsets do not cancel out. */
function sampleSd(values: readonly number[], m: number): number {
  return Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (values.length - 1))
}

function averageMovingRange(values: readonly number[]): number {
  let sum = 0
  for (let i = 1; i < values.length; i++) sum += Math.abs(values[i] - values[i - 1])
  return sum / (values.length - 1)
}

/**
 * Cp = (USL − LSL) / 6σ and Cpk = min(USL − μ, μ − LSL) / 3σ from a mean and a sigma. With one
 * limit Cpk uses that side alone and Cp is null; with no limit, or σ = 0, both are null.
 */
export function capabilityFromMoments(
  mu: number,
  sigma: number,
  limits: SpecLimits = {},
): CapabilityIndices {
  const { lower, upper } = limits
  if (!Number.isFinite(mu)) throw new RangeError('mean must be a finite number')
  if (!(sigma >= 0) || !Number.isFinite(sigma)) throw new RangeError('sigma must be 0 or more')
  if (
    (lower !== undefined && !Number.isFinite(lower)) ||
    (upper !== undefined && !Number.isFinite(upper))
  )
    throw new RangeError('limits must be finite numbers')
  if (lower !== undefined && upper !== undefined && lower > upper)
    throw new RangeError('lower limit is above the upper limit')
  if (sigma === 0) return { cp: null, cpk: null }
  const sides: number[] = []
  if (upper !== undefined) sides.push((upper - mu) / (3 * sigma))
  if (lower !== undefined) sides.push((mu - lower) / (3 * sigma))
  const cp = lower !== undefined && upper !== undefined ? (upper - lower) / (6 * sigma) : null
  // Cpk ≤ Cp holds exactly; the extra min keeps rounding from breaking it for a centred mean.
  const cpk = sides.length > 0 ? Math.min(...sides, cp ?? Infinity) : null
  return { cp, cpk }
}

/**
 * Mean, overall and within sigma, Cp/Cpk (within) and Pp/Ppk (overall) of a series in time
 * order. Fewer than 2 values, or no spread, leaves the sigmas' indices null.
 */
export function capability(values: readonly number[], limits: SpecLimits = {}): Capability {
  finiteValues(values)
  const n = values.length
  const m = n > 0 ? mean(values) : null
  // Check the limits even when there is too little data to use them.
  capabilityFromMoments(m ?? 0, 0, limits)
  if (m === null || n < 2)
    return { n, mean: m, sdOverall: null, sdWithin: null, cp: null, cpk: null, pp: null, ppk: null }
  const sdOverall = sampleSd(values, m)
  const sdWithin = averageMovingRange(values) / controlChartConstants(2).d2
  const within = capabilityFromMoments(m, sdWithin, limits)
  const overall = capabilityFromMoments(m, sdOverall, limits)
  return { n, mean: m, sdOverall, sdWithin, ...within, pp: overall.cp, ppk: overall.cpk }
}

/** Individuals (X) and moving-range chart limits. */
export interface IndividualsChart {
  center: number
  ucl: number
  lcl: number
  mrCenter: number
  mrUcl: number
}

/**
 * X chart at mean ± 3·MR̄/d2 (≈ 2.66·MR̄) and MR chart with UCL D4·MR̄ (3.267·MR̄, LCL 0),
 * using moving ranges of 2. Needs at least 2 values (RangeError otherwise).
 */
export function individualsChart(values: readonly number[]): IndividualsChart {
  finiteValues(values)
  if (values.length < 2) throw new RangeError('an individuals chart needs at least 2 values')
  const { d2, D4 } = controlChartConstants(2)
  const center = mean(values)
  const mrCenter = averageMovingRange(values)
  const spread = (3 * mrCenter) / d2
  return { center, ucl: center + spread, lcl: center - spread, mrCenter, mrUcl: D4 * mrCenter }
}

/** X-bar and R chart limits for subgroups of one size. */
export interface XbarRChart {
  n: number
  center: number
  ucl: number
  lcl: number
  rCenter: number
  rUcl: number
  rLcl: number
}

/**
 * X-bar/R limits: X̿ ± A2·R̄ and R̄·D3 to R̄·D4. Every subgroup must have the same size, 2–10
 * (RangeError otherwise), and there must be at least one subgroup.
 */
export function xbarRChart(subgroups: readonly (readonly number[])[]): XbarRChart {
  if (subgroups.length === 0) throw new RangeError('an X-bar/R chart needs at least 1 subgroup')
  const n = subgroups[0].length
  if (subgroups.some((g) => g.length !== n)) throw new RangeError('subgroups differ in size')
  const { A2, D3, D4 } = controlChartConstants(n)
  subgroups.forEach(finiteValues)
  const center = mean(subgroups.map(mean))
  const rCenter = mean(subgroups.map((g) => Math.max(...g) - Math.min(...g)))
  return {
    n,
    center,
    ucl: center + A2 * rCenter,
    lcl: center - A2 * rCenter,
    rCenter,
    rUcl: D4 * rCenter,
    rLcl: D3 * rCenter,
  }
}

/** A p-chart: the pooled fraction defective and each subgroup's fraction with its own limits. */
export interface PChart {
  center: number
  points: { p: number; ucl: number; lcl: number }[]
}

/**
 * p-chart with p̄ = Σ defective / Σ size and limits p̄ ± 3·√(p̄(1 − p̄)/nᵢ) per subgroup, so they
 * widen for small subgroups. LCL is clipped at 0 and UCL at 1 (a fraction cannot leave [0, 1]).
 */
export function pChart(samples: readonly { defective: number; size: number }[]): PChart {
  if (samples.length === 0) throw new RangeError('a p-chart needs at least 1 subgroup')
  for (const { defective, size } of samples) {
    if (!Number.isInteger(size) || size < 1) throw new RangeError('size must be 1 or more')
    if (!Number.isInteger(defective) || defective < 0 || defective > size)
      throw new RangeError('defective must be a whole number from 0 to size')
  }
  const total = samples.reduce((s, x) => s + x.size, 0)
  const center = samples.reduce((s, x) => s + x.defective, 0) / total
  const points = samples.map(({ defective, size }) => {
    const spread = 3 * Math.sqrt((center * (1 - center)) / size)
    return {
      p: defective / size,
      ucl: Math.min(1, center + spread),
      lcl: Math.max(0, center - spread),
    }
  })
  return { center, points }
}
