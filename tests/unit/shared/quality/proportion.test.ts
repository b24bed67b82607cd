import fc from 'fast-check'
import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import {
  betaQuantile,
  clopperPearsonInterval,
  normalQuantile,
  regularizedBeta,
  wilsonInterval,
} from '../../../../shared/quality/proportion'

const TOL = 6 // toBeCloseTo digits: |diff| < 5e-7, inside the 1e-6 tolerance

function expectInterval(actual: { low: number; high: number }, low: number, high: number): void {
  expect(actual.low).toBeCloseTo(low, TOL)
  expect(actual.high).toBeCloseTo(high, TOL)
}

describe('wilsonInterval', () => {
  it('matches published worked intervals', () => {
    // Newcombe (1998) Statistics in Medicine 17:857–872, illustrative intervals, method 3 (from memory).
    expectInterval(wilsonInterval(81, 263), 0.255289, 0.36621)
    // Same source: 15 of 148.
    expectInterval(wilsonInterval(15, 148), 0.062386, 0.160487)
    // Same source: 0 of 20; the lower end is exactly 0.
    expectInterval(wilsonInterval(0, 20), 0, 0.161125)
    expect(wilsonInterval(0, 20).low).toBe(0)
  })

  it('uses the quantile for the confidence asked for', () => {
    // Wilson (1927) formula, z = 1.6448536; computed.
    expectInterval(wilsonInterval(12, 30, 0.9), 0.267126, 0.549419)
  })

  it('gives [0, 1] for no trials and 1 as the upper end for all successes', () => {
    expect(wilsonInterval(0, 0)).toEqual({ low: 0, high: 1 })
    expect(wilsonInterval(20, 20).high).toBe(1)
  })
})

describe('clopperPearsonInterval', () => {
  it('matches published worked intervals', () => {
    // Newcombe (1998), method 5 (from memory); cross-check jstat `jStat.beta.inv`.
    expectInterval(clopperPearsonInterval(81, 263), 0.252737, 0.367622)
    // Same source: 0 of 20; high = 1 − 0.025^(1/20) in closed form.
    expectInterval(clopperPearsonInterval(0, 20), 0, 0.168433)
    expect(clopperPearsonInterval(0, 20).low).toBe(0)
  })

  it('has exact ends at 0 and n, and [0, 1] for no trials', () => {
    expect(clopperPearsonInterval(20, 20).high).toBe(1)
    expect(clopperPearsonInterval(0, 0)).toEqual({ low: 0, high: 1 })
  })

  it('agrees with jstat beta quantiles for the interval ends', () => {
    // Cross-check: jstat jStat.beta.inv, an independent implementation (jstat stops at ~1e-8).
    const cases: [number, number][] = [
      [1, 1], [1, 10], [3, 10], [5, 10], [9, 10], [1, 50], [7, 50], [25, 50], [49, 50],
      [2, 263], [81, 263], [200, 263], [15, 148], [100, 1000], [999, 1000], [1, 2000],
    ] // prettier-ignore
    for (const [x, n] of cases) {
      for (const confidence of [0.9, 0.95, 0.99]) {
        const alpha = 1 - confidence
        const { low, high } = clopperPearsonInterval(x, n, confidence)
        expect(low).toBeCloseTo(jStat.beta.inv(alpha / 2, x, n - x + 1), 8)
        if (x < n) expect(high).toBeCloseTo(jStat.beta.inv(1 - alpha / 2, x + 1, n - x), 8)
      }
    }
  })
})

describe('normalQuantile', () => {
  it('gives the familiar two-sided z values', () => {
    // Common practice, from memory: z(0.975) = 1.959963985, z(0.95) = 1.644853627.
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 9)
    expect(normalQuantile(0.95)).toBeCloseTo(1.644853627, 9)
    expect(normalQuantile(0.5)).toBe(0)
    expect(normalQuantile(0)).toBe(-Infinity)
  })

  it('agrees with jstat on a grid of probabilities', () => {
    // Cross-check: jstat jStat.normal.inv; both agree to ~1e-12 away from the far tails.
    const ps = [1e-6, 1e-4, 0.001, 0.01, 0.02425, 0.975, 0.99, 0.999, 1 - 1e-4]
    for (let i = 1; i < 40; i++) ps.push(i / 40)
    for (const p of ps) expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 9)
  })
})

describe('regularizedBeta and betaQuantile', () => {
  it('agree with jstat and invert each other', () => {
    // Cross-check: jstat jStat.ibeta and jStat.beta.inv, to 1e-6: jstat's own inverse is only
    // good to ~3e-8 for shapes below 1 (it gives 0.50000003 for Beta(0.5, 0.5) at p = 0.5).
    const shapes: [number, number][] = [[0.5, 0.5], [1, 1], [2, 5], [5, 2], [10, 30], [81, 183], [0.3, 4]] // prettier-ignore
    for (const [a, b] of shapes) {
      for (const p of [0.005, 0.025, 0.2, 0.5, 0.8, 0.975]) {
        const q = betaQuantile(p, a, b)
        expect(q).toBeCloseTo(jStat.beta.inv(p, a, b), TOL)
        expect(regularizedBeta(q, a, b)).toBeCloseTo(p, 12)
        expect(regularizedBeta(p, a, b)).toBeCloseTo(jStat.ibeta(p, a, b), TOL)
      }
    }
    // Common practice, no source: closed forms I_x(a, 1) = x^a and I_x(1, b) = 1 − (1 − x)^b.
    expect(regularizedBeta(0.3, 2.5, 1)).toBeCloseTo(0.3 ** 2.5, 14)
    expect(regularizedBeta(0.3, 1, 4)).toBeCloseTo(1 - 0.7 ** 4, 14)
    // Same: a symmetric beta has its median at exactly 1/2.
    expect(betaQuantile(0.5, 0.5, 0.5)).toBeCloseTo(0.5, 14)
    expect(betaQuantile(0.5, 7, 7)).toBeCloseTo(0.5, 14)
  })
})

describe('interval properties', () => {
  const counts = fc
    .integer({ min: 1, max: 500 })
    .chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n)))
  const confidence = fc.double({ min: 0.5, max: 0.999, noNaN: true })

  it('contain the point estimate and stay within [0, 1]', () => {
    fc.assert(
      fc.property(counts, confidence, ([x, n], c) => {
        for (const { low, high } of [wilsonInterval(x, n, c), clopperPearsonInterval(x, n, c)]) {
          expect(low).toBeGreaterThanOrEqual(0)
          expect(high).toBeLessThanOrEqual(1)
          expect(low).toBeLessThanOrEqual(x / n)
          expect(high).toBeGreaterThanOrEqual(x / n)
        }
      }),
    )
  })
})

describe('input checks', () => {
  it('refuses bad counts and confidences with a RangeError', () => {
    for (const f of [wilsonInterval, clopperPearsonInterval]) {
      expect(() => f(-1, 10)).toThrow(RangeError)
      expect(() => f(11, 10)).toThrow(RangeError)
      expect(() => f(1.5, 10)).toThrow(RangeError)
      expect(() => f(1, 10.5)).toThrow(RangeError)
      expect(() => f(1, 10, 0)).toThrow(RangeError)
      expect(() => f(1, 10, 1)).toThrow(RangeError)
      expect(() => f(1, 10, Number.NaN)).toThrow(RangeError)
    }
    expect(() => normalQuantile(1.2)).toThrow(RangeError)
    expect(() => betaQuantile(0.5, 0, 1)).toThrow(RangeError)
  })
})
