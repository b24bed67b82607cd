// Western Electric run rules 1–4 for a chart with a known centre line and sigma.

/** A rule that the window of points ending at `index` meets. */
export interface RuleViolation {
  rule: 1 | 2 | 3 | 4
  index: number
}

// Each rule: window length, how many points in it must be beyond `sigmas`·σ on one side.
// Rule 4 uses 0 σ: strictly above or strictly below the centre, so a point on it breaks the run.
const RULES: readonly { rule: 1 | 2 | 3 | 4; window: number; needed: number; sigmas: number }[] = [
  { rule: 1, window: 1, needed: 1, sigmas: 3 },
  { rule: 2, window: 3, needed: 2, sigmas: 2 },
  { rule: 3, window: 5, needed: 4, sigmas: 1 },
  { rule: 4, window: 8, needed: 8, sigmas: 0 },
]

/**
 * Every index at which the window of points ending there meets Western Electric rule 1 (a point
 * beyond 3σ), 2 (2 of 3 beyond 2σ on one side), 3 (4 of 5 beyond 1σ on one side) or 4 (8 in a row
 * on one side). Zone tests are strict: a point exactly on 3σ is not beyond it. A window is only
 * tested once it is full, so the first possible rule-2 index is 2. Sorted by index, then rule.
 */
export function runRuleViolations(
  values: readonly number[],
  center: number,
  sigma: number,
): RuleViolation[] {
  if (!Number.isFinite(center)) throw new RangeError('centre must be a finite number')
  if (!Number.isFinite(sigma) || sigma <= 0) throw new RangeError('sigma must be positive')
  if (!values.every(Number.isFinite)) throw new RangeError('values must be finite numbers')
  const found: RuleViolation[] = []
  for (let index = 0; index < values.length; index++) {
    for (const { rule, window, needed, sigmas } of RULES) {
      if (index + 1 < window) continue
      const slice = values.slice(index + 1 - window, index + 1)
      // Compare with the limit itself (centre ± kσ) so a value equal to a drawn limit is on it.
      const above = slice.filter((v) => v > center + sigmas * sigma).length
      const below = slice.filter((v) => v < center - sigmas * sigma).length
      if (above >= needed || below >= needed) found.push({ rule, index })
    }
  }
  return found
}
