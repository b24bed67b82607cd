import { describe, expect, it } from 'vitest'
import {
  alertEmailSubject,
  alertEmailText,
  alertHeadline,
  fpyBreach,
  runRuleBreaches,
  runRuleName,
} from '../../../../shared/quality/alerts'
import type { AlertSubject, ChartPoint } from '../../../../shared/quality/alerts'
import { wilsonInterval } from '../../../../shared/quality/proportion'

const TOL = 9

const series = (values: number[]): ChartPoint[] =>
  values.map((value, i) => ({ serial: `U${String(i + 1).padStart(2, '0')}`, value }))

describe('fpyBreach', () => {
  it('trips below the threshold once 10 units have a first attempt', () => {
    const d = fpyBreach({ passedFirst: 8, firstAttempts: 10, thresholdPercent: 90 })
    // 8 / 10 = 0.8 (arithmetic), below 90 %.
    expect(d).toMatchObject({ kind: 'fpy', passedFirst: 8, firstAttempts: 10, fpy: 0.8 })
    // The interval is the shared Wilson interval (its own reference checks are in proportion.test).
    expect(d!.interval).toEqual(wilsonInterval(8, 10))
  })

  it('waits for 10 first attempts, and an FPY equal to the threshold is not below it', () => {
    expect(fpyBreach({ passedFirst: 0, firstAttempts: 9, thresholdPercent: 90 })).toBeNull()
    // 9 / 10 is exactly 90 %: not below it (whole-number comparison, no rounding).
    expect(fpyBreach({ passedFirst: 9, firstAttempts: 10, thresholdPercent: 90 })).toBeNull()
    // 29 / 30 = 96.67 % against 96.67 %: just below (29·100 = 2900 < 96.67·30 = 2900.1).
    expect(
      fpyBreach({ passedFirst: 29, firstAttempts: 30, thresholdPercent: 96.67 }),
    ).not.toBeNull()
    expect(fpyBreach({ passedFirst: 0, firstAttempts: 40, thresholdPercent: 0 })).toBeNull()
  })

  it('refuses impossible counts', () => {
    expect(() => fpyBreach({ passedFirst: 11, firstAttempts: 10, thresholdPercent: 90 })).toThrow(
      RangeError,
    )
    expect(() => fpyBreach({ passedFirst: 1.5, firstAttempts: 10, thresholdPercent: 90 })).toThrow(
      RangeError,
    )
    expect(() => fpyBreach({ passedFirst: 1, firstAttempts: 10, thresholdPercent: 120 })).toThrow(
      RangeError,
    )
  })
})

describe('runRuleBreaches', () => {
  it('uses the nominal as centre and the average moving range / 1.128 as sigma', () => {
    // Constructed. Moving ranges: seven of 0.2 and one of 0.8, so MR̄ = 2.2 / 8 = 0.275 and
    // σ = 0.275 / 1.128 (d2 for n = 2, NIST/SEMATECH e-Handbook §6.3.2 constants table).
    // 3σ = 0.7314; 11.0 is 0.9 above the nominal 10.1, the others 0.1 from it: rule 1 at 8 only.
    const points = series([10, 10.2, 10, 10.2, 10, 10.2, 10, 10.2, 11])
    const found = runRuleBreaches(points, 10.1)
    expect(found).toHaveLength(1)
    expect(found[0]).toMatchObject({
      kind: 'run_rule',
      rule: 1,
      centre: 10.1,
      centreSource: 'nominal',
      points: 9,
      index: 8,
      serial: 'U09',
      value: 11,
      window: [{ serial: 'U09', value: 11 }],
    })
    expect(found[0]!.sigma).toBeCloseTo(0.275 / 1.128, TOL)
  })

  it('uses the lot mean without a nominal, and reports each rule once at its first index', () => {
    // Constructed: eight units near 1.1, then eight near 3.1 (a bench that shifted).
    // Mean 2.1; moving ranges 0.2 × 14 and 1.8 once, MR̄ = 4.6 / 15, σ = MR̄ / 1.128 = 0.27187.
    // The first points sit 0.9–1.1 below the centre (beyond 3σ = 0.816 at 1.0, beyond 2σ at 1.2):
    // rule 1 at 0, rule 2 at 2 (3 of 3 beyond 2σ), rule 3 at 4 (5 of 5 beyond 1σ), rule 4 at 7.
    const values = [1, 1.2, 1, 1.2, 1, 1.2, 1, 1.2, 3, 3.2, 3, 3.2, 3, 3.2, 3, 3.2]
    const found = runRuleBreaches(series(values), null)
    expect(found.map((f) => [f.rule, f.index])).toEqual([
      [1, 0],
      [2, 2],
      [3, 4],
      [4, 7],
    ])
    for (const f of found) {
      expect(f.centreSource).toBe('lot_mean')
      expect(f.centre).toBeCloseTo(2.1, TOL)
      expect(f.sigma).toBeCloseTo(4.6 / 15 / 1.128, TOL)
    }
    // Each rule's window: 1, 3, 5 and 8 points ending at its index.
    expect(found.map((f) => f.window.length)).toEqual([1, 3, 5, 8])
    expect(found[3]!.window.map((p) => p.serial)).toEqual([
      'U01',
      'U02',
      'U03',
      'U04',
      'U05',
      'U06',
      'U07',
      'U08',
    ])
  })

  it('says nothing with fewer than 8 values or with no spread', () => {
    expect(runRuleBreaches(series([1, 1, 1, 1, 1, 1, 9]), null)).toEqual([])
    expect(runRuleBreaches(series([5, 5, 5, 5, 5, 5, 5, 5, 5]), 4)).toEqual([])
  })

  it('names the rules as stored', () => {
    expect([1, 2, 3, 4].map((r) => runRuleName(r as 1 | 2 | 3 | 4))).toEqual([
      'run_rule_1',
      'run_rule_2',
      'run_rule_3',
      'run_rule_4',
    ])
  })
})

describe('alert wording', () => {
  const fpy: AlertSubject = {
    rule: 'fpy_below_threshold',
    details: fpyBreach({ passedFirst: 8, firstAttempts: 10, thresholdPercent: 90 })!,
    lotNumber: 'L-0042',
    stepName: 'Load test',
    checkLabel: null,
    checkUnit: null,
  }
  const [shift] = runRuleBreaches(series([10, 10.2, 10, 10.2, 10, 10.2, 10, 10.2, 11]), 10.1)
  const run: AlertSubject = {
    rule: 'run_rule_1',
    details: shift!,
    lotNumber: 'L-0042',
    stepName: 'Winding',
    checkLabel: 'Secondary inductance',
    checkUnit: 'mH',
  }

  it('puts lot, step and rule in the subject', () => {
    expect(alertEmailSubject(fpy)).toBe(
      'Quality alert: lot L-0042, Load test: FPY 80.0 % below 90 %',
    )
    expect(alertEmailSubject(run)).toBe(
      'Quality alert: lot L-0042, Winding: Secondary inductance broke run rule 1',
    )
  })

  it('gives the figures and the link to the lot in the body', () => {
    const text = alertEmailText(fpy, 'http://waymark.example/lots/abc')
    expect(text).toContain('8 of 10 units passed at their first attempt')
    expect(text).toContain('Threshold set on the revision: 90 %')
    expect(text).toContain('95 % Wilson interval: 49.0 % to 94.3 %')
    expect(text).toContain('Open the lot: http://waymark.example/lots/abc')
    const chart = alertEmailText(run, 'http://waymark.example/lots/abc')
    expect(chart).toContain("centre 10.1 mH (the check's nominal)")
    expect(chart).toContain('average moving range of the lot')
    expect(chart).toContain('/ 1.128')
    expect(chart).toContain('U09 11 mH')
    expect(alertHeadline(run)).toBe(
      'Secondary inductance broke run rule 1 at unit U09: 11 mH, point 9 of 9 in build order',
    )
    expect(chart).toContain(
      'Lot L-0042, step Winding: run rule 1 (a point more than 3σ from the centre).',
    )
    expect(text).toContain(
      "Lot L-0042, step Load test: first-pass yield below the revision's threshold.",
    )
  })
})
