import { describe, expect, it } from 'vitest'
import {
  efficiency,
  lineRegulation,
  loadRegulation,
  ripplePercent,
} from '../../../shared/converter'
import { suggestedHipotVolts } from '../../../shared/safety/hipot'

describe('converter load-test arithmetic', () => {
  it('computes efficiency as a fraction', () => {
    // Common practice, no source: 48 V × 2.5 A in, 12 V × 9 A out → 0.9.
    expect(efficiency({ vin: 48, iin: 2.5, vout: 12, iout: 9 })).toBeCloseTo(0.9, 6)
  })

  it('computes load regulation in % of the full-load voltage', () => {
    // Common practice: 12 V no load, 11 V full load → 9.090909 %.
    expect(loadRegulation(12, 11)).toBeCloseTo(9.090909, 6)
  })

  it('computes line regulation against the nominal', () => {
    // Common practice, no source: 11.98 V low line, 12.02 V high line, 12 V nominal → 0.333333 %.
    expect(lineRegulation(11.98, 12.02, 12)).toBeCloseTo(0.333333, 6)
  })

  it('computes ripple as % of output', () => {
    // Common practice, no source: 0.12 V p-p on 12 V → 1 %.
    expect(ripplePercent(0.12, 12)).toBeCloseTo(1, 6)
  })

  it('refuses a zero input power or output voltage', () => {
    expect(() => efficiency({ vin: 0, iin: 1, vout: 1, iout: 1 })).toThrow(RangeError)
    expect(() => ripplePercent(0.1, 0)).toThrow(RangeError)
  })
})

describe('suggestedHipotVolts', () => {
  it('follows the 2U + 1000 V rule of thumb with the DC equivalent', () => {
    // Common practice rule of thumb 2U + 1000 V (standards govern): 230 V basic → 1460 V AC, 2064.75 V DC.
    const basic = suggestedHipotVolts(230, 'basic')
    expect(basic.ac).toBeCloseTo(1460, 6)
    expect(basic.dc).toBeCloseTo(2064.75, 2)
    // Common practice: reinforced insulation doubles the basic value.
    expect(suggestedHipotVolts(230, 'reinforced').ac).toBeCloseTo(2920, 6)
  })
})
