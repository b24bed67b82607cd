import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  capability,
  capabilityFromMoments,
  controlChartConstants,
  individualsChart,
  pChart,
  runRuleViolations,
  xbarRChart,
} from '../../../../shared/quality/spc'

const TOL = 6 // toBeCloseTo digits: |diff| < 5e-7, inside the 1e-6 tolerance

// NIST/SEMATECH e-Handbook §6.3.2.2 data (flow rate).
const FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]

describe('capability', () => {
  it('gets mean and sd exactly right on a large offset', () => {
    // NIST StRD univariate dataset NumAcc1, certified values: mean 10000002, sd 1 (exactly).
    const c = capability([10000001, 10000003, 10000002])
    expect(c.mean).toBe(10000002)
    expect(c.sdOverall).toBe(1)
  })

  it('gives mean, sigmas and indices for the flow-rate data', () => {
    // NIST/SEMATECH e-Handbook §6.3.2.2 data (flow rate), sd computed.
    const c = capability(FLOW, { lower: 45, upper: 57 })
    expect(c.n).toBe(10)
    expect(c.mean).toBeCloseTo(50.81, TOL)
    expect(c.sdOverall).toBeCloseTo(2.033852, TOL)
    // Data from §6.3.2.2; limits invented for the test; common practice formulas.
    expect(c.sdWithin).toBeCloseTo(1.664697, TOL)
    expect(c.cp).toBeCloseTo(1.20142, TOL)
    expect(c.cpk).toBeCloseTo(1.163375, TOL)
    expect(c.pp).toBeCloseTo(0.983356, TOL)
    expect(c.ppk).toBeCloseTo(0.952216, TOL)
  })

  it('uses one side for Cpk/Ppk and null for Cp/Pp with one limit', () => {
    // Common practice, no source: Cpk = (57 − 50.81) / (3 · 1.664697) = 1.239465.
    const c = capability(FLOW, { upper: 57 })
    expect(c.cp).toBeNull()
    expect(c.pp).toBeNull()
    expect(c.cpk).toBeCloseTo(1.239465, TOL)
    expect(capability(FLOW).cpk).toBeNull()
  })

  it('gives nulls, never NaN or Infinity, for too little data or no spread', () => {
    const nulls = { sdOverall: null, sdWithin: null, cp: null, cpk: null, pp: null, ppk: null }
    expect(capability([], { lower: 0, upper: 1 })).toEqual({ n: 0, mean: null, ...nulls })
    expect(capability([3], { lower: 0, upper: 5 })).toEqual({ n: 1, mean: 3, ...nulls })
    const flat = capability([2, 2, 2], { lower: 0, upper: 5 })
    expect(flat).toMatchObject({ sdOverall: 0, sdWithin: 0, cp: null, cpk: null, pp: null })
  })

  it('computes Cp and Cpk from a mean and sigma', () => {
    // NIST/SEMATECH e-Handbook §6.1.6: μ 16, σ 2, LSL 8, USL 20 → Cp 1.0, Cpk 0.666667.
    const c = capabilityFromMoments(16, 2, { lower: 8, upper: 20 })
    expect(c.cp).toBeCloseTo(1, TOL)
    expect(c.cpk).toBeCloseTo(0.666667, TOL)
  })

  it('never has Cpk above Cp', () => {
    const limit = fc.double({ min: -1e3, max: 1e3, noNaN: true })
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 2, maxLength: 30 }),
        limit,
        limit,
        (values, a, b) => {
          const c = capability(values, { lower: Math.min(a, b), upper: Math.max(a, b) })
          if (c.cp !== null && c.cpk !== null) expect(c.cpk).toBeLessThanOrEqual(c.cp)
          if (c.pp !== null && c.ppk !== null) expect(c.ppk).toBeLessThanOrEqual(c.pp)
        },
      ),
    )
  })

  it('refuses crossed limits and non-finite values', () => {
    expect(() => capability(FLOW, { lower: 5, upper: 1 })).toThrow(RangeError)
    expect(() => capability([1, Number.NaN])).toThrow(RangeError)
    expect(() => capabilityFromMoments(0, -1, {})).toThrow(RangeError)
  })
})

describe('control charts', () => {
  it('gives individuals and moving-range limits', () => {
    // NIST/SEMATECH e-Handbook §6.3.2.2 individuals example.
    const c = individualsChart(FLOW)
    expect(c.center).toBeCloseTo(50.81, TOL)
    expect(c.mrCenter).toBeCloseTo(1.877778, TOL)
    expect(c.ucl).toBeCloseTo(55.80409, TOL)
    expect(c.lcl).toBeCloseTo(45.81591, TOL)
    expect(c.mrUcl).toBeCloseTo(6.1347, 4)
    expect(() => individualsChart([1])).toThrow(RangeError)
  })

  it('has the table constants for subgroup sizes', () => {
    // NIST/SEMATECH e-Handbook §6.3.2 constants table; ASTM E2587 (from memory).
    const expected: [number, number, number, number, number][] = [
      [2, 1.88, 0, 3.267, 1.128],
      [5, 0.577, 0, 2.114, 2.326],
      [8, 0.373, 0.136, 1.864, 2.847],
    ]
    for (const [n, A2, D3, D4, d2] of expected) {
      const k = controlChartConstants(n)
      expect(Math.abs(k.A2 - A2)).toBeLessThanOrEqual(0.0015)
      expect(Math.abs(k.D3 - D3)).toBeLessThanOrEqual(0.0015)
      expect(Math.abs(k.D4 - D4)).toBeLessThanOrEqual(0.0015)
      expect(Math.abs(k.d2 - d2)).toBeLessThanOrEqual(0.0015)
    }
    for (const n of [1, 11, 4.5]) expect(() => controlChartConstants(n)).toThrow(RangeError)
  })

  it('gives X-bar/R limits for subgroups of 4', () => {
    // Constructed; formulas of §6.3.2.1 with A2 0.729, D4 2.282.
    const c = xbarRChart([
      [9.98, 10.02, 10.01, 9.99],
      [10.03, 10, 9.97, 10.01],
      [10, 10.04, 10.02, 9.99],
      [9.96, 10.01, 10, 10.02],
      [10.01, 9.99, 10.03, 10],
      [10.02, 9.98, 10, 10.01],
    ])
    expect(c.n).toBe(4)
    expect(c.center).toBeCloseTo(10.00375, TOL)
    expect(c.rCenter).toBeCloseTo(0.0483333, TOL)
    expect(c.ucl).toBeCloseTo(10.038985, TOL)
    expect(c.lcl).toBeCloseTo(9.968515, TOL)
    expect(c.rUcl).toBeCloseTo(0.1102967, TOL)
    expect(c.rLcl).toBe(0)
  })

  it('refuses unequal or out-of-table subgroup sizes', () => {
    expect(() => xbarRChart([[1, 2], [1, 2, 3]])).toThrow(RangeError) // prettier-ignore
    expect(() => xbarRChart([[1], [2]])).toThrow(RangeError)
    expect(() => xbarRChart([Array.from({ length: 11 }, (_, i) => i)])).toThrow(RangeError)
    expect(() => xbarRChart([])).toThrow(RangeError)
  })

  it('gives p-chart limits and flags the out-of-control wafers', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods §6.3.3.2 (wafer example).
    const defectives = [
      12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12,
      7, 13, 9, 6,
    ]
    const c = pChart(defectives.map((defective) => ({ defective, size: 50 })))
    expect(c.center).toBeCloseTo(0.231333, TOL)
    expect(c.points[0].ucl).toBeCloseTo(0.410239, TOL)
    expect(c.points[0].lcl).toBeCloseTo(0.052428, TOL)
    const above = c.points.flatMap((p, i) => (p.p > p.ucl ? [i] : []))
    expect(above).toEqual([14, 22])
    expect(c.points.some((p) => p.p < p.lcl)).toBe(false)
  })

  it('widens p-chart limits for small subgroups and clips them to [0, 1]', () => {
    // Common practice, no source: p̄ = 3/40 = 0.075; n = 10 gives 0.075 ± 3·√(0.075·0.925/10).
    const c = pChart([
      { defective: 1, size: 10 },
      { defective: 2, size: 30 },
    ])
    expect(c.center).toBeCloseTo(0.075, 12)
    expect(c.points[0].ucl).toBeCloseTo(0.075 + 3 * Math.sqrt((0.075 * 0.925) / 10), 12)
    expect(c.points[0].lcl).toBe(0)
    expect(pChart([{ defective: 1, size: 2 }]).points[0].ucl).toBe(1)
    expect(() => pChart([{ defective: 3, size: 2 }])).toThrow(RangeError)
    expect(() => pChart([])).toThrow(RangeError)
  })
})

describe('runRuleViolations', () => {
  it('flags one point beyond 3σ', () => {
    // Constructed.
    expect(runRuleViolations([0.5, -0.3, 3.2, 0.1, -0.4], 0, 1)).toEqual([{ rule: 1, index: 2 }])
  })

  it('reports every index whose window meets rules 1–3, sorted by index then rule', () => {
    // Constructed; every index whose window ending there meets the rule; zone tests strict.
    const values = [-0.2, -2.4, -2.6, 0.1, -1.2, -1.4, -0.3, -1.1, -1.6, -3.4]
    expect(runRuleViolations(values, 0, 1)).toEqual([
      { rule: 2, index: 2 },
      { rule: 2, index: 3 },
      { rule: 3, index: 5 },
      { rule: 3, index: 8 },
      { rule: 1, index: 9 },
      { rule: 3, index: 9 },
    ])
  })

  it('treats a point exactly on a limit as not beyond it', () => {
    // Constructed: points exactly on 3σ and on 2σ, also where centre + 3σ is not exact in binary.
    expect(runRuleViolations([3, 2, 0, 2, -3], 0, 1)).toEqual([])
    expect(runRuleViolations([10.3, 10.2, 10.2, 9.8, 9.7], 10, 0.1)).toEqual([])
    expect(runRuleViolations([0, 0, 0, 0, 0, 0, 0, 0], 0, 1)).toEqual([])
  })

  it('finds a run of 8 on either side, and a point on the centre breaks it', () => {
    // Constructed: 8 strictly on one side within ±1σ, so rule 4 alone fires.
    const side = fc.constantFrom(1, -1)
    const offsets = fc.array(fc.double({ min: 0.01, max: 0.99, noNaN: true }), {
      minLength: 8,
      maxLength: 8,
    })
    fc.assert(
      fc.property(side, offsets, (s, d) => {
        const values = d.map((v) => 5 + s * v * 2)
        expect(runRuleViolations(values, 5, 2)).toEqual([{ rule: 4, index: 7 }])
        expect(runRuleViolations([...values.slice(0, 4), 5, ...values.slice(4)], 5, 2)).toEqual([])
      }),
    )
  })

  it('refuses a non-positive sigma', () => {
    expect(() => runRuleViolations([1], 0, 0)).toThrow(RangeError)
  })
})
