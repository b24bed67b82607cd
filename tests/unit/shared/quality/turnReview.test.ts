import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  deviationChart,
  histogram,
  isRatioMiscount,
  median,
  turnsOffMedian,
  turnVerdict,
} from '../../../../shared/quality/turnReview'

describe('median', () => {
  it('takes the middle value, or the mean of the two middle ones (common practice, no source)', () => {
    expect(median([3, 1, 2])).toBe(2)
    expect(median([4, 1, 3, 2])).toBe(2.5)
    expect(median([])).toBeNull()
  })
})

describe('turnsOffMedian', () => {
  it('reads a unit against the lot median core: L = AL·N², so N = N_nom·√(L/L_med)', () => {
    // 2 turns too many on 92: L ∝ N², so L/L_med = (94/92)² and the estimate is 94 − 92 = 2
    // (L = AL·N², common practice).
    expect(turnsOffMedian(92, 25.4 * (94 / 92) ** 2, 25.4)).toBeCloseTo(2, 12)
    expect(turnsOffMedian(92, 25.4, 25.4)).toBe(0)
    expect(() => turnsOffMedian(92, 0, 25.4)).toThrow(RangeError)
  })

  it('cancels a lot-wide AL offset: the same cores times any factor read the same', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.75, max: 1.25, noNaN: true }),
        fc.integer({ min: 80, max: 104 }),
        (k, n) => {
          const al = 3e-6 * k
          expect(turnsOffMedian(92, al * n * n, al * 92 * 92)).toBeCloseTo(n - 92, 9)
        },
      ),
    )
  })
})

describe('isRatioMiscount', () => {
  it('flags a ratio estimate that rounds to another whole turn (DESIGN.md §7)', () => {
    expect(isRatioMiscount(91.98, 92)).toBe(false)
    expect(isRatioMiscount(92.49, 92)).toBe(false)
    expect(isRatioMiscount(94.02, 92)).toBe(true)
    expect(isRatioMiscount(91.4, 92)).toBe(true)
  })
})

describe('histogram', () => {
  it('bins several series alike, whole numbers in the middle of a bar (common practice)', () => {
    const bins = histogram(
      [
        [0, 0.1, 2.02],
        [1.1, -0.3],
      ],
      0.5,
    )
    // Edges at multiples of 0.5 offset by 0.25: −0.3 → [−0.75, −0.25); 2.02 → [1.75, 2.25).
    expect(bins.map((b) => [b.from, b.to])).toEqual([
      [-0.75, -0.25],
      [-0.25, 0.25],
      [0.25, 0.75],
      [0.75, 1.25],
      [1.25, 1.75],
      [1.75, 2.25],
    ])
    expect(bins.map((b) => b.counts)).toEqual([
      [0, 1],
      [2, 0],
      [0, 0],
      [0, 1],
      [0, 0],
      [1, 0],
    ])
    expect(histogram([[], []], 0.5)).toEqual([])
    expect(() => histogram([[1]], 0)).toThrow(RangeError)
  })

  it('puts every value in exactly one bin', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -20, max: 20, noNaN: true }), { minLength: 1, maxLength: 50 }),
        (values) => {
          const bins = histogram([values], 0.5)
          expect(bins.reduce((n, b) => n + b.counts[0]!, 0)).toBe(values.length)
        },
      ),
    )
  })
})

describe('deviationChart', () => {
  it('centres on zero with σ from the moving range and marks rule 1', () => {
    // Moving ranges 0.06, 1.98, 2.10, 0.06, 0, 0, 0 → MR̄ 4.2 / 7 = 0.6, σ = 0.6/1.128 (d2 for
    // n = 2, NIST/SEMATECH e-Handbook §6.3.2); 3σ = 1.5957, so only 2.02 is beyond: rule 1 at 2.
    const c = deviationChart([-0.02, 0.04, 2.02, -0.08, -0.02, -0.02, -0.02, -0.02])
    expect(c.center).toBe(0)
    expect(c.sigma).toBeCloseTo(0.6 / 1.128, 12)
    expect(c.ucl).toBeCloseTo((3 * 0.6) / 1.128, 12)
    expect(c.lcl).toBeCloseTo((-3 * 0.6) / 1.128, 12)
    expect(c.violations).toEqual([{ rule: 1, index: 2 }])
    expect(c).toMatchObject({ judgement: 'judged', judgementText: null })
  })

  it('marks what the rules see from 2 values on', () => {
    // Seven points: MR̄ 4.2 / 6 = 0.7 (arithmetic), 3σ = 1.8617; 2.02 is beyond: rule 1 at 2.
    const c = deviationChart([-0.02, 0.04, 2.02, -0.08, -0.02, -0.02, -0.02])
    expect(c.sigma).toBeCloseTo(0.7 / 1.128, 12)
    expect(c).toMatchObject({ violations: [{ rule: 1, index: 2 }], judgement: 'judged' })
  })

  it('gives no limits for one value or no spread', () => {
    expect(deviationChart([1])).toMatchObject({
      sigma: null,
      ucl: null,
      violations: [],
      judgement: 'too_few_points',
      judgementText: 'not enough variation to judge',
    })
    expect(deviationChart([0.5, 0.5, 0.5])).toMatchObject({
      sigma: null,
      violations: [],
      judgement: 'no_spread',
      judgementText: 'not enough variation to judge',
    })
  })
})

describe('turnVerdict', () => {
  const base = { runs: 20, nominalTurns: 92 }
  it('calls a lot-wide offset of 1.5 turns or more a core lot (common practice, no source)', () => {
    // 92·(√1.04 − 1) = 1.82 turns: core lot; 92·(√0.97 − 1) = −1.39: within.
    expect(turnVerdict({ ...base, suspects: 0, medianToNominal: 1.04 })).toBe('core_lot')
    expect(turnVerdict({ ...base, suspects: 0, medianToNominal: 0.97 })).toBe('in_line')
    expect(turnVerdict({ ...base, suspects: 2, medianToNominal: 0.97 })).toBe('miscount')
    expect(turnVerdict({ ...base, suspects: 2, medianToNominal: 1.06 })).toBe(
      'core_lot_and_miscount',
    )
    expect(turnVerdict({ ...base, suspects: 0, medianToNominal: null })).toBe('in_line')
    expect(turnVerdict({ ...base, runs: 0, suspects: 0, medianToNominal: null })).toBe('no_data')
  })
})
