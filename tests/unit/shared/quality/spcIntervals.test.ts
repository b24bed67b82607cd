import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import { chiSquareQuantile, cpInterval, cpkInterval } from '../../../../shared/quality/spcIntervals'

describe('chiSquareQuantile', () => {
  it('matches printed table values', () => {
    // NIST/SEMATECH e-Handbook §1.3.6.7.4 (critical values of the chi-square distribution),
    // ν = 19: lower-tail 0.025 → 8.907, 0.975 → 32.852; ν = 1: 0.95 → 3.841.
    expect(chiSquareQuantile(0.025, 19)).toBeCloseTo(8.907, 3)
    expect(chiSquareQuantile(0.975, 19)).toBeCloseTo(32.852, 3)
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841, 3)
  })

  it('agrees with jstat over a range of df (cross-check, not a published value)', () => {
    for (const df of [2, 5, 9, 29, 99])
      for (const p of [0.025, 0.5, 0.975])
        expect(chiSquareQuantile(p, df)).toBeCloseTo(jStat.gamma.inv(p, df / 2, 2), 6)
  })

  it('refuses df of 0', () => {
    expect(() => chiSquareQuantile(0.5, 0)).toThrow(RangeError)
  })
})

describe('cpInterval', () => {
  it('reproduces the textbook example', () => {
    // Montgomery, Introduction to Statistical Quality Control, §8.3.5 example (from memory):
    // n = 20, Ĉp = 2.29, 95 % interval 1.57 ≤ Cp ≤ 3.01.
    const { low, high } = cpInterval(2.29, 20)
    expect(low).toBeCloseTo(1.57, 2)
    expect(high).toBeCloseTo(3.01, 2)
  })

  it('narrows as n grows and with a lower confidence', () => {
    // Common practice, no source: the interval shrinks with more data or less confidence.
    const a = cpInterval(1.33, 20)
    const b = cpInterval(1.33, 200)
    const c = cpInterval(1.33, 20, 0.9)
    expect(b.high - b.low).toBeLessThan(a.high - a.low)
    expect(c.high - c.low).toBeLessThan(a.high - a.low)
    expect(a.low).toBeLessThan(1.33)
    expect(a.high).toBeGreaterThan(1.33)
  })

  it('refuses fewer than 2 values and a bad confidence', () => {
    expect(() => cpInterval(1, 1)).toThrow(RangeError)
    expect(() => cpInterval(1, 10, 1)).toThrow(RangeError)
    expect(() => cpInterval(-1, 10)).toThrow(RangeError)
  })
})

describe('cpkInterval', () => {
  it('reproduces the textbook example of Bissell’s interval', () => {
    // Montgomery, §8.3.5 example of Bissell (1990) (from memory): n = 20, Ĉpk = 1.33,
    // 95 % interval 0.88 ≤ Cpk ≤ 1.78.
    const { low, high } = cpkInterval(1.33, 20)
    expect(low).toBeCloseTo(0.88, 2)
    expect(high).toBeCloseTo(1.78, 2)
  })

  it('is symmetric about the estimate and finite at Cpk = 0', () => {
    // Bissell's approximation is Ĉpk ± half-width (Montgomery §8.3.5); at 0 only 1/(9n) is left.
    const { low, high } = cpkInterval(0, 9)
    expect(high).toBeCloseTo(1.959964 * Math.sqrt(1 / 81), 6)
    expect(low).toBeCloseTo(-high, 12)
  })
})
