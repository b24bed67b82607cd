import { describe, expect, it } from 'vitest'
import { NOT_ENOUGH_VARIATION } from '../../../../shared/quality/episodes'
import { seriesStatistics } from '../../../../shared/quality/spcSeries'

// NIST/SEMATECH e-Handbook §6.3.2.2 data (flow rate), as in spc.test.ts.
const FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1]

describe('seriesStatistics', () => {
  it('gives I-MR limits, moving ranges and capability with intervals', () => {
    const s = seriesStatistics(FLOW, { lower: 45, upper: 57 })
    expect(s.judgement).toBe('judged')
    expect(s.judgementText).toBeNull()
    // Moving ranges by hand from the data (common practice, no source): |47.6 − 49.6| = 2, ...
    expect(s.movingRanges).toHaveLength(9)
    expect(s.movingRanges[0]).toBeCloseTo(2, 9)
    expect(s.movingRanges[8]).toBeCloseTo(1.5, 9)
    // MR̄ = 16.9 / 9 = 1.877778; X limits mean ± 2.66·MR̄ (3/1.128), MR UCL 3.267·MR̄
    // (Montgomery §6.4, d2 = 1.128 and D4 = 3.267 for n = 2).
    expect(s.chart!.center).toBeCloseTo(50.81, 9)
    expect(s.chart!.mrCenter).toBeCloseTo(1.877778, 6)
    expect(s.chart!.ucl).toBeCloseTo(50.81 + (3 * 1.877778) / 1.128, 5)
    expect(s.chart!.mrUcl).toBeCloseTo(3.267 * 1.877778, 5)
    // Cp/Cpk as in spc.test.ts (limits invented for the test).
    expect(s.capability.cp).toBeCloseTo(1.20142, 5)
    expect(s.capability.cpk).toBeCloseTo(1.163375, 5)
    // Intervals: the formulas of spcIntervals.ts with n = 10, so they bracket the estimates.
    expect(s.cpInterval!.low).toBeLessThan(1.20142)
    expect(s.cpInterval!.high).toBeGreaterThan(1.20142)
    expect(s.cpkInterval!.low).toBeLessThan(1.163375)
    expect(s.cpkInterval!.high).toBeGreaterThan(1.163375)
    expect(s.mrAbove).toEqual([])
  })

  it('flags a shift by the run rules and a jump on the MR chart', () => {
    // Invented series (common practice, no source): ten steady points, then a jump of 10σ.
    const steady = [10, 10.2, 9.9, 10.1, 9.8, 10.0, 10.2, 9.9, 10.1, 10.0]
    const s = seriesStatistics([...steady, 14, 14.1, 13.9])
    expect(s.violations.some((v) => v.rule === 1 && v.index === 10)).toBe(true)
    expect(s.mrAbove).toContain(10)
  })

  it('says not enough variation for a flat or a short series', () => {
    const flat = seriesStatistics(Array(12).fill(0.91), { lower: 0.85 })
    expect(flat.judgement).toBe('no_spread')
    expect(flat.judgementText).toBe(NOT_ENOUGH_VARIATION)
    expect(flat.chart).toBeNull()
    expect(flat.capability.cpk).toBeNull()
    expect(flat.capability.mean).toBeCloseTo(0.91, 12)
    const short = seriesStatistics([1, 2, 3])
    expect(short.judgement).toBe('too_few_points')
    expect(short.judgementText).toBe(NOT_ENOUGH_VARIATION)
    expect(short.cpkInterval).toBeNull()
    expect(seriesStatistics([]).n).toBe(0)
  })
})
