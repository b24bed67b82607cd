// Confidence intervals for the capability indices (issue 20 point 4). Cp from the chi-square
// distribution of the sample variance, Cpk by Bissell's (1990) normal approximation, both as
// given in Montgomery, "Introduction to Statistical Quality Control", §8.3.5 (6th ed.).
import { gammaQuantile } from './poisson'
import { normalQuantile } from './proportion'

/** A two-sided confidence interval for a capability index. */
export interface IndexInterval {
  low: number
  high: number
}

/** The χ² quantile with `df` degrees of freedom: x with P(χ²_df ≤ x) = p. */
export function chiSquareQuantile(p: number, df: number): number {
  if (!(df > 0)) throw new RangeError('degrees of freedom must be positive')
  // χ²_df is a gamma distribution with shape df/2 and scale 2.
  return 2 * gammaQuantile(p, df / 2)
}

function checkArguments(n: number, confidence: number): void {
  if (!Number.isInteger(n) || n < 2) throw new RangeError('n must be a whole number of 2 or more')
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must be in (0, 1)')
}

/**
 * Interval for Cp from an estimate on n values: Ĉp·√(χ²_{α/2, n−1} / (n − 1)) to
 * Ĉp·√(χ²_{1−α/2, n−1} / (n − 1)) (lower-tail quantiles). It assumes a normal process and a
 * sigma with n − 1 degrees of freedom; with the moving-range sigma it is an approximation.
 */
export function cpInterval(cp: number, n: number, confidence = 0.95): IndexInterval {
  checkArguments(n, confidence)
  if (!Number.isFinite(cp) || cp < 0) throw new RangeError('Cp must be 0 or more')
  const alpha = 1 - confidence
  const df = n - 1
  return {
    low: cp * Math.sqrt(chiSquareQuantile(alpha / 2, df) / df),
    high: cp * Math.sqrt(chiSquareQuantile(1 - alpha / 2, df) / df),
  }
}

/**
 * Bissell's interval for Cpk: Ĉpk·[1 ± z_{α/2}·√(1/(9·n·Ĉpk²) + 1/(2(n − 1)))], written as
 * Ĉpk ± z·√(1/(9n) + Ĉpk²/(2(n − 1))) so that Ĉpk = 0 does not divide by zero.
 */
export function cpkInterval(cpk: number, n: number, confidence = 0.95): IndexInterval {
  checkArguments(n, confidence)
  if (!Number.isFinite(cpk)) throw new RangeError('Cpk must be a finite number')
  const z = normalQuantile(1 - (1 - confidence) / 2)
  const half = z * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * (n - 1)))
  return { low: cpk - half, high: cpk + half }
}
