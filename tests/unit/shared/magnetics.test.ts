import { describe, expect, it } from 'vitest'
import {
  faradayTurns,
  secondaryTurnsFromRatio,
  turnDeviation,
  turnsFromInductance,
  windingBalance,
} from '../../../shared/magnetics'

describe('magnetics', () => {
  it('estimates turns from inductance with L = AL·N²', () => {
    // Common practice, L = AL·N²: 1 mH on AL 2500 nH/turn² is 20 turns.
    expect(turnsFromInductance(1e-3, 2500)).toBeCloseTo(20, 6)
    // Same formula: 10 µH on AL 160 nH/turn² is 7.905694 turns.
    expect(turnsFromInductance(10e-6, 160)).toBeCloseTo(7.905694, 6)
  })

  it('flags a miscount when the estimate rounds to another whole turn', () => {
    // Common practice, no source: 92 turns on AL 3000 give 25.392 mH; 90 turns give 24.3 mH.
    const ok = turnDeviation({
      nominalTurns: 92,
      inductanceH: 3000e-9 * 92 * 92,
      alNanoHenry: 3000,
    })
    expect(ok.deviation).toBeCloseTo(0, 9)
    expect(ok.miscount).toBe(false)
    const short = turnDeviation({
      nominalTurns: 92,
      inductanceH: 3000e-9 * 90 * 90,
      alNanoHenry: 3000,
    })
    expect(short.estimatedTurns).toBeCloseTo(90, 9)
    expect(short.deviation).toBeCloseTo(-2, 9)
    expect(short.deviationPercent).toBeCloseTo((-2 / 92) * 100, 9)
    expect(short.miscount).toBe(true)
  })

  it('gives secondary turns from a voltage-ratio test', () => {
    // N_s = N_p·V_s/V_p, common practice: 6 turns, 10 V in, 153.333 V out → 92 turns.
    expect(secondaryTurnsFromRatio(6, 10, 153.3333333)).toBeCloseTo(92, 5)
  })

  it('measures the imbalance of two halves against their mean', () => {
    // Common practice, no source: 110 and 90 µH differ by 20 on a mean of 100 → 20 %.
    expect(windingBalance(110e-6, 90e-6)).toBeCloseTo(20, 9)
    expect(windingBalance(1, 1)).toBe(0)
  })

  it('computes Faraday turns for square and sine waves', () => {
    // McLyman, Transformer and Inductor Design Handbook (from memory): N = V/(k·f·B·Ae).
    expect(
      faradayTurns({
        volts: 10.5,
        frequencyHz: 50e3,
        peakFluxT: 0.13,
        coreAreaM2: 125e-6,
        waveform: 'square',
      }),
    ).toBeCloseTo(3.230769, 6)
    expect(
      faradayTurns({
        volts: 230,
        frequencyHz: 50,
        peakFluxT: 1.2,
        coreAreaM2: 1000e-6,
        waveform: 'sine',
      }),
    ).toBeCloseTo(863.3634, 4)
  })

  it('refuses non-positive inputs with a RangeError', () => {
    expect(() => turnsFromInductance(0, 3000)).toThrow(RangeError)
    expect(() => turnsFromInductance(1e-3, -1)).toThrow(RangeError)
    expect(() => secondaryTurnsFromRatio(6, 0, 10)).toThrow(RangeError)
  })
})
