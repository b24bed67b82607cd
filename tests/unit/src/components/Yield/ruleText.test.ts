import { describe, expect, it } from 'vitest'
import { ruleLines } from '../../../../../src/components/Yield/ruleText'

describe('ruleLines', () => {
  it('lists each broken rule once with its build positions as ranges (common practice)', () => {
    expect(
      ruleLines([
        { rule: 1, index: 10 },
        { rule: 1, index: 11 },
        { rule: 2, index: 11 },
        { rule: 1, index: 12 },
        { rule: 1, index: 20 },
      ]),
    ).toEqual(['Rule 1 (a point beyond 3σ): run 11–13, 21', 'Rule 2 (2 of 3 beyond 2σ): run 12'])
    expect(ruleLines([])).toEqual([])
  })
})
