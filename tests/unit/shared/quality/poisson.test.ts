import jStat from 'jstat'
import { describe, expect, it } from 'vitest'
import {
  dpuInterval,
  poissonMeanInterval,
  regularizedGammaP,
} from '../../../../shared/quality/poisson'

describe('poissonMeanInterval (exact, Garwood 1936)', () => {
  it('gives the tabled 95 % limits', () => {
    // Garwood (1936) Biometrika 28:437–442 exact limits, as tabled in most texts (from memory,
    // 4 significant figures): k = 0: 0 – 3.689; 1: 0.0253 – 5.572; 2: 0.2422 – 7.225;
    // 10: 4.795 – 18.39.
    const cases: [number, number, number][] = [
      [0, 0, 3.689],
      [1, 0.0253, 5.572],
      [2, 0.2422, 7.225],
      [10, 4.795, 18.39],
    ]
    for (const [k, low, high] of cases) {
      const i = poissonMeanInterval(k)
      expect(i.low).toBeCloseTo(low, 3)
      expect(Math.abs(i.high - high) / high).toBeLessThan(5e-4)
    }
  })

  it('has the closed form for k = 0: high = −ln(α/2)', () => {
    // P(X = 0 | μ) = e^−μ = α/2 (common practice, no source).
    expect(poissonMeanInterval(0).high).toBeCloseTo(-Math.log(0.025), 9)
    expect(poissonMeanInterval(0, 0.9).high).toBeCloseTo(-Math.log(0.05), 9)
  })

  it('agrees with jstat gamma quantiles', () => {
    // Cross-check: jStat.gamma.inv, an independent implementation.
    for (const k of [1, 3, 7, 25, 120]) {
      const i = poissonMeanInterval(k)
      expect(i.low).toBeCloseTo(jStat.gamma.inv(0.025, k, 1), 6)
      expect(i.high).toBeCloseTo(jStat.gamma.inv(0.975, k + 1, 1), 6)
    }
  })

  it('computes P(a, x) on both sides of a + 1', () => {
    // P(1, x) = 1 − e^−x (common practice, no source).
    for (const x of [0.1, 1, 1.9, 2.1, 8])
      expect(regularizedGammaP(1, x)).toBeCloseTo(1 - Math.exp(-x), 12)
  })

  it('scales to a rate per unit, and refuses bad input', () => {
    const d = dpuInterval(2, 5)
    expect(d.value).toBeCloseTo(0.4, 12)
    expect(d.interval.low).toBeCloseTo(poissonMeanInterval(2).low / 5, 12)
    expect(dpuInterval(0, 0)).toEqual({ value: null, interval: { low: 0, high: Infinity } })
    expect(() => poissonMeanInterval(-1)).toThrow(RangeError)
    expect(() => poissonMeanInterval(1.5)).toThrow(RangeError)
    expect(() => poissonMeanInterval(1, 1)).toThrow(RangeError)
  })
})
