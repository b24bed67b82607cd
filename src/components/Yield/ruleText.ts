import type { RuleViolation } from '@shared/quality/spc'

/** The Western Electric rules in words, for the chart's legend line. */
export const RULE_WORDS: Record<RuleViolation['rule'], string> = {
  1: 'a point beyond 3σ',
  2: '2 of 3 beyond 2σ',
  3: '4 of 5 beyond 1σ',
  4: '8 in a row on one side',
}

/** "11–16, 18" from 0-based indexes, as 1-based build positions. */
function ranges(indexes: number[]): string {
  const sorted = [...new Set(indexes)].sort((a, b) => a - b).map((i) => i + 1)
  const parts: string[] = []
  for (let k = 0; k < sorted.length; k++) {
    const start = sorted[k]!
    while (k + 1 < sorted.length && sorted[k + 1] === sorted[k]! + 1) k++
    parts.push(start === sorted[k] ? `${start}` : `${start}–${sorted[k]}`)
  }
  return parts.join(', ')
}

/** One line per broken rule: which rule, in words, and at which build positions. */
export function ruleLines(violations: readonly RuleViolation[]): string[] {
  const rules = [...new Set(violations.map((v) => v.rule))].sort()
  return rules.map(
    (r) =>
      `Rule ${r} (${RULE_WORDS[r]}): run ${ranges(violations.filter((v) => v.rule === r).map((v) => v.index))}`,
  )
}
