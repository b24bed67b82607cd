// Exact (Garwood) interval for the mean of a Poisson count, used for defects per unit: a unit
// can fail more than once, so DPU is a rate, not a proportion, and has no binomial interval.
import { lnGamma } from './proportion'

const EPS = 1e-15
const TINY = 1e-300

/** Regularized lower incomplete gamma P(a, x) (series below a + 1, continued fraction above). */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0) || !(x >= 0)) throw new RangeError('need a > 0 and x ≥ 0')
  if (x === 0) return 0
  const front = Math.exp(-x + a * Math.log(x) - lnGamma(a))
  if (x < a + 1) {
    let term = 1 / a
    let sum = term
    for (let n = 1; n < 10_000 && Math.abs(term) > Math.abs(sum) * EPS; n++) {
      term *= x / (a + n)
      sum += term
    }
    return Math.min(1, sum * front)
  }
  // Modified Lentz for the continued fraction of Q(a, x).
  let b = x + 1 - a
  let c = 1 / TINY
  let d = 1 / b
  let h = d
  for (let i = 1; i < 10_000; i++) {
    const an = -i * (i - a)
    b += 2
    d = an * d + b
    if (Math.abs(d) < TINY) d = TINY
    c = b + an / c
    if (Math.abs(c) < TINY) c = TINY
    d = 1 / d
    const step = d * c
    h *= step
    if (Math.abs(step - 1) < EPS) break
  }
  return Math.max(0, 1 - front * h)
}

/** x with P(a, x) = p, by bisection (P is increasing in x). */
export function gammaQuantile(p: number, a: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError('p must be between 0 and 1')
  let low = 0
  let high = Math.max(1, a)
  while (regularizedGammaP(a, high) < p) high *= 2
  for (let i = 0; i < 200 && high - low > 1e-14 * Math.max(1, high); i++) {
    const mid = (low + high) / 2
    if (regularizedGammaP(a, mid) < p) low = mid
    else high = mid
  }
  return (low + high) / 2
}

export interface RateInterval {
  low: number
  high: number
}

/**
 * Exact two-sided interval for the mean of a Poisson count (Garwood 1936):
 * low = Γ⁻¹(α/2; k), high = Γ⁻¹(1 − α/2; k + 1), with low = 0 for k = 0. Divide by the exposure
 * (units started) for a rate such as DPU.
 */
export function poissonMeanInterval(count: number, confidence = 0.95): RateInterval {
  if (!Number.isInteger(count) || count < 0)
    throw new RangeError('count must be a whole number ≥ 0')
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must be in (0, 1)')
  const alpha = 1 - confidence
  return {
    low: count === 0 ? 0 : gammaQuantile(alpha / 2, count),
    high: gammaQuantile(1 - alpha / 2, count + 1),
  }
}

/** Defects per unit with its exact Poisson interval; null value and [0, ∞) without units. */
export function dpuInterval(
  defects: number,
  units: number,
  confidence = 0.95,
): { value: number | null; interval: RateInterval } {
  if (!Number.isInteger(units) || units < 0)
    throw new RangeError('units must be a whole number ≥ 0')
  if (units === 0) return { value: null, interval: { low: 0, high: Infinity } }
  const { low, high } = poissonMeanInterval(defects, confidence)
  return { value: defects / units, interval: { low: low / units, high: high / units } }
}
