// Binomial confidence intervals (DESIGN.md §7) and the two quantile functions they need.
// No runtime dependency: the normal quantile is Acklam's rational approximation polished by one
// Halley step, the beta quantile a bisection on the continued-fraction incomplete beta.

/** Two-sided confidence interval for a proportion; both ends in [0, 1]. */
export interface ProportionInterval {
  low: number
  high: number
}

const SQRT2 = Math.SQRT2
const SQRT_2PI = Math.sqrt(2 * Math.PI)

/** erfc(x) for x ≥ 0: a positive-term series below 3, a continued fraction above (no cancellation). */
function erfcNonNegative(x: number): number {
  if (x < 3) {
    // erf(x) = 2/√π · e^(−x²) · Σ (2x²)^k · x / (1·3·…·(2k+1))
    let term = x
    let sum = x
    for (let k = 1; k < 200 && term > sum * 1e-17; k++) {
      term *= (2 * x * x) / (2 * k + 1)
      sum += term
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * Math.exp(-x * x) * sum
  }
  // erfc(x) = e^(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …)))), evaluated from the tail up.
  let f = x
  for (let k = 60; k >= 1; k--) f = x + k / 2 / f
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / f
}

/** Standard normal lower-tail probability Φ(z), accurate in both tails. */
function normalCdf(z: number): number {
  const e = erfcNonNegative(Math.abs(z) / SQRT2) / 2
  return z < 0 ? e : 1 - e
}

const A = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269]
const A_TAIL = [-30.66479806614716, 2.506628277459239]
const B = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972]
const B_TAIL = -13.28068155288572
const C = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734]
const C_TAIL = [4.374664141464968, 2.938163982698783]
const D = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416]

function acklamTail(q: number): number {
  const num = ((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C_TAIL[0]) * q + C_TAIL[1]
  return num / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1)
}

/**
 * Standard normal quantile z with Φ(z) = p, for 0 < p < 1 (±Infinity at 0 and 1).
 * Acklam's approximation (relative error about 1e-9) then one Halley step on Φ(z) − p.
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError('probability must be in [0, 1]')
  if (p === 0) return -Infinity
  if (p === 1) return Infinity
  let x: number
  if (p < 0.02425) x = acklamTail(Math.sqrt(-2 * Math.log(p)))
  else if (p > 1 - 0.02425) x = -acklamTail(Math.sqrt(-2 * Math.log(1 - p)))
  else {
    const q = p - 0.5
    const r = q * q
    const num = ((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A_TAIL[0]) * r + A_TAIL[1]
    x = (num * q) / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B_TAIL) * r + 1)
  }
  // Work on the smaller tail so the residual keeps its relative precision.
  const e = x < 0 ? normalCdf(x) - p : 1 - p - normalCdf(-x)
  const u = e * SQRT_2PI * Math.exp((x * x) / 2)
  return x - u / (1 + (x * u) / 2)
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
]

/** ln Γ(x) for x > 0 (Lanczos, g = 7). */
export function lnGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x)
  const y = x - 1
  let sum = LANCZOS[0]
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (y + i)
  const t = y + 7.5
  return 0.5 * Math.log(2 * Math.PI) + (y + 0.5) * Math.log(t) - t + Math.log(sum)
}

/** Continued fraction for I_x(a, b), modified Lentz; converges fast for x < (a+1)/(a+b+2). */
function betaFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300
  let c = 1
  let d = 1 - ((a + b) * x) / (a + 1)
  d = 1 / (Math.abs(d) < tiny ? tiny : d)
  let h = d
  for (let m = 1; m < 100000; m++) {
    for (const num of [
      (m * (b - m) * x) / ((a + 2 * m - 1) * (a + 2 * m)),
      (-(a + m) * (a + b + m) * x) / ((a + 2 * m) * (a + 2 * m + 1)),
    ]) {
      d = 1 + num * d
      d = 1 / (Math.abs(d) < tiny ? tiny : d)
      c = 1 + num / c
      if (Math.abs(c) < tiny) c = tiny
      h *= d * c
    }
    if (Math.abs(d * c - 1) < 1e-16) break
  }
  return h
}

/** Regularized incomplete beta I_x(a, b), the beta(a, b) distribution function at x. */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0)) throw new RangeError('beta shape parameters must be positive')
  if (!(x >= 0 && x <= 1)) throw new RangeError('x must be in [0, 1]')
  if (x === 0 || x === 1) return x
  const front = Math.exp(
    lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log1p(-x),
  )
  if (x < (a + 1) / (a + b + 2)) return (front * betaFraction(x, a, b)) / a
  return 1 - (front * betaFraction(1 - x, b, a)) / b
}

/** Beta(a, b) quantile: the x with I_x(a, b) = p, by bisection down to adjacent doubles. */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError('probability must be in [0, 1]')
  if (!(a > 0 && b > 0)) throw new RangeError('beta shape parameters must be positive')
  if (p === 0 || p === 1) return p
  let lo = 0
  let hi = 1
  for (let i = 0; i < 1100; i++) {
    const mid = (lo + hi) / 2
    if (mid === lo || mid === hi) break
    if (regularizedBeta(mid, a, b) < p) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}

function checkInput(successes: number, trials: number, confidence: number): void {
  if (!Number.isInteger(trials) || trials < 0)
    throw new RangeError('trials must be a whole number, 0 or more')
  if (!Number.isInteger(successes) || successes < 0 || successes > trials)
    throw new RangeError('successes must be a whole number from 0 to trials')
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must be in (0, 1)')
}

/**
 * Wilson score interval for successes / trials (Wilson 1927). It stays inside [0, 1] and behaves
 * at 0 and n, where the textbook normal interval collapses. `{ low: 0, high: 1 }` for 0 trials.
 */
export function wilsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): ProportionInterval {
  checkInput(successes, trials, confidence)
  if (trials === 0) return { low: 0, high: 1 }
  const z = normalQuantile(1 - (1 - confidence) / 2)
  const z2 = z * z
  const centre = (successes + z2 / 2) / (trials + z2)
  const half = (z / (trials + z2)) * Math.sqrt((successes * (trials - successes)) / trials + z2 / 4)
  // The ends are exactly 0 and 1 in exact arithmetic; pin them so rounding cannot cross p̂.
  return {
    low: successes === 0 ? 0 : Math.max(0, centre - half),
    high: successes === trials ? 1 : Math.min(1, centre + half),
  }
}

/**
 * Clopper–Pearson ("exact") interval: beta quantiles B(α/2; x, n−x+1) and B(1−α/2; x+1, n−x),
 * with low 0 at x = 0 and high 1 at x = n. Conservative: coverage is at least the confidence.
 */
export function clopperPearsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): ProportionInterval {
  checkInput(successes, trials, confidence)
  if (trials === 0) return { low: 0, high: 1 }
  const alpha = 1 - confidence
  const fails = trials - successes
  return {
    low: successes === 0 ? 0 : betaQuantile(alpha / 2, successes, fails + 1),
    high: fails === 0 ? 1 : betaQuantile(1 - alpha / 2, successes + 1, fails),
  }
}
