import { describe, expect, it } from 'vitest'
import {
  alertEmailSubject,
  alertEmailText,
  alertHeadline,
  alertRules,
  alertSummary,
  checkSeries,
  digestEmailSubject,
  digestEmailText,
  fpyBreach,
  runRuleName,
  whatToCheck,
} from '../../../../shared/quality/alerts'
import type { AlertSubject, SeriesCheck } from '../../../../shared/quality/alerts'
import { nextEpisode, readEpisode, seriesBasis } from '../../../../shared/quality/episodes'
import type { EpisodePoint } from '../../../../shared/quality/episodes'
import { wilsonInterval } from '../../../../shared/quality/proportion'

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

describe('runRuleName', () => {
  it('names the rules as stored', () => {
    expect([1, 2, 3, 4].map((r) => runRuleName(r as 1 | 2 | 3 | 4))).toEqual([
      'run_rule_1',
      'run_rule_2',
      'run_rule_3',
      'run_rule_4',
    ])
  })
})

describe('checkSeries', () => {
  const check = (over: Partial<SeriesCheck> & { key: string; position: number }): SeriesCheck => ({
    id: over.key,
    unit: null,
    nominal: null,
    derived: null,
    derivedInputs: null,
    ...over,
  })
  // The winding step of the demo FP-24350, reduced to what grouping reads.
  const checks = [
    check({ key: 'secondary_turns', position: 0, unit: 'turns', nominal: 92 }),
    check({ key: 'l_secondary', position: 1, unit: 'mH', nominal: 25.4 }),
    check({
      key: 'secondary_turns_est',
      position: 2,
      unit: 'turns',
      nominal: 92,
      derived: 'turns_from_inductance',
      derivedInputs: { inductance: 'l_secondary', winding: 'w1' },
    }),
    check({
      key: 'secondary_turn_dev',
      position: 3,
      unit: 'turns',
      nominal: 0,
      derived: 'turn_deviation',
      derivedInputs: { inductance: 'l_secondary', winding: 'w1' },
    }),
    check({ key: 'v_pri', position: 4, unit: 'V', nominal: 10 }),
    check({ key: 'v_sec', position: 5, unit: 'V', nominal: 153.3 }),
    check({
      key: 'turns_ratio',
      position: 6,
      unit: 'turns',
      nominal: 92,
      derived: 'secondary_turns_from_ratio',
      derivedInputs: { primaryWinding: 'w0', primaryVolts: 'v_pri', secondaryVolts: 'v_sec' },
    }),
  ]

  it('makes one series of a reading and the checks derived from it, headed by the telling one', () => {
    const series = checkSeries(checks)
    expect(series.map((s) => [s.head.key, s.members.map((m) => m.key)])).toEqual([
      ['secondary_turns', ['secondary_turns']],
      ['secondary_turn_dev', ['l_secondary', 'secondary_turns_est', 'secondary_turn_dev']],
      ['turns_ratio', ['v_pri', 'v_sec', 'turns_ratio']],
    ])
  })

  it("judges values that carry the core's AL tolerance against the lot mean, others the nominal", () => {
    const series = checkSeries(checks)
    expect(series.map((s) => s.nominal)).toEqual([92, null, 92])
    expect(
      checkSeries([check({ key: 'l', position: 0, unit: 'µH', nominal: 108 })])[0]!.nominal,
    ).toBeNull()
  })
})

describe('whatToCheck', () => {
  it('points a winding bench at the turn counter for a turn count, the core for an inductance', () => {
    expect(whatToCheck('winding', { unit: 'turns', derived: 'secondary_turns_from_ratio' })).toBe(
      'check the turn counter and recount a suspect unit',
    )
    expect(whatToCheck('winding', { unit: 'mH', derived: null })).toContain('core lot')
    expect(whatToCheck('winding', { unit: '%', derived: 'winding_balance' })).toContain(
      'primary halves',
    )
    expect(whatToCheck('load_test', { unit: 'V', derived: null })).toContain('load bank')
    expect(whatToCheck('hipot', null)).toContain('Pareto')
  })
})

const points = (values: number[], station: (i: number) => string | null): EpisodePoint[] =>
  values.map((value, i) => ({
    serial: `U${String(i + 1).padStart(2, '0')}`,
    value,
    station: station(i),
    operator: i % 2 ? 'Ann Ode' : 'Bo Lind',
  }))

/** The details the worker stores for the first episode of a series (as in the server). */
function episodeOf(values: number[], nominal: number, station: (i: number) => string | null) {
  const basis = seriesBasis(values, nominal)
  const episode = nextEpisode(values, basis.centre!, basis.sigma!)!
  const pts = points(values, station)
  return {
    kind: 'run_rule' as const,
    rules: episode.rules,
    centre: basis.centre!,
    centreSource: basis.centreSource,
    sigma: basis.sigma!,
    points: values.length,
    start: episode.start,
    last: episode.last,
    serial: pts[episode.start]!.serial,
    ...readEpisode(pts, episode, basis.centre!, basis.sigma!),
    hint: 'check the turn counter and recount a suspect unit',
  }
}

describe('alert wording', () => {
  const fpy: AlertSubject = {
    rule: 'fpy_below_threshold',
    details: {
      ...fpyBreach({ passedFirst: 8, firstAttempts: 10, thresholdPercent: 90 })!,
      station: null,
      hint: "look at this step's defect codes (the Pareto on the Yield board)",
    },
    lotNumber: 'L-0042',
    stepName: 'Load test',
    checkLabel: null,
    checkUnit: null,
  }
  // Constructed: 20 secondaries counting 92.0–92.1 turns by the ratio test, then 6 at 94.0
  // wound at Winding bench 2, then 2 good ones.
  const calm = Array.from({ length: 20 }, (_, i) => (i % 2 ? 92.1 : 92))
  const values = [...calm, 94, 94, 94, 94, 94, 94, 92, 92.1]
  const run: AlertSubject = {
    rule: 'run_rule_1',
    details: episodeOf(values, 92, (i) =>
      i >= 20 && i < 26 ? 'Winding bench 2' : 'Winding bench 1',
    ),
    lotNumber: 'L-0042',
    stepName: 'Winding',
    checkLabel: 'Secondary turns from ratio',
    checkUnit: 'turns',
  }

  it('says first, in plain words, where, how many, how far and what to check', () => {
    // 94.0 − 92 = 2 turns over (arithmetic); 6 of the 8 points up to the last hit.
    expect(alertSummary(run)).toBe(
      'Winding bench 2: 6 of the last 8 units read about 2 turns over on Secondary turns from ratio; check the turn counter and recount a suspect unit.',
    )
    expect(alertSummary(fpy)).toBe(
      "Load test: first-pass yield 80.0 % (8 of 10 first attempts) is below the 90 % threshold; look at this step's defect codes (the Pareto on the Yield board).",
    )
  })

  it('names the operator only when every point shares one, and no bench when they differ', () => {
    const spread: AlertSubject = {
      ...run,
      details: episodeOf(values, 92, (i) => `Winding bench ${i % 2}`),
    }
    expect(alertSummary(spread)).toMatch(/^Winding: 6 of the last 8 units/)
    expect(alertSummary(spread)).not.toContain('all by')
  })

  it('puts lot, step and every broken rule in the subject', () => {
    expect(alertEmailSubject(fpy)).toBe(
      'Quality alert: lot L-0042, Load test: FPY 80.0 % below 90 %',
    )
    expect(alertEmailSubject(run)).toBe(
      'Quality alert: lot L-0042, Winding: Secondary turns from ratio out of control (run rules 1, 2, 3)',
    )
    expect(alertRules(run.details)).toEqual(['run_rule_1', 'run_rule_2', 'run_rule_3'])
  })

  it('gives plain words, the link, then the figures in the body', () => {
    const text = alertEmailText(fpy, 'http://waymark.example/lots/abc')
    expect(text.split('\n')[1]).toBe(alertSummary(fpy))
    expect(text).toContain('8 of 10 units passed at their first attempt')
    expect(text).toContain('Threshold set on the revision: 90 %')
    // Wilson 95 % interval of 8 / 10 (Newcombe 1998, Table I method 3 gives 0.490–0.943).
    expect(text).toContain('95 % Wilson interval: 49.0 % to 94.3 %')
    expect(text).toContain('Open the lot: http://waymark.example/lots/abc')
    const chart = alertEmailText(run, 'http://waymark.example/lots/abc')
    expect(chart.indexOf(alertSummary(run))).toBeLessThan(chart.indexOf('The figures:'))
    expect(chart).toContain("centre 92 turns (the check's nominal)")
    expect(chart).toContain('/ 1.128')
    expect(chart).toContain('U21 94 turns (Winding bench 2)')
    expect(alertHeadline(run)).toBe(
      'Secondary turns from ratio broke run rules 1, 2, 3 from unit U21 (points 21–27 of 28 in build order)',
    )
  })

  it('lists every alert of a digest, plain words first', () => {
    const items = [
      { subject: fpy, lotUrl: 'http://w/lots/1' },
      { subject: { ...run, lotNumber: 'L-0043' }, lotUrl: 'http://w/lots/2' },
    ]
    expect(digestEmailSubject(items)).toBe('Quality alerts: 2 new episodes on 2 lots')
    const text = digestEmailText(items, 60)
    expect(text).toContain('at most one such digest every 60 minutes')
    expect(text).toContain(`Lot L-0043, Winding: ${alertSummary(run)}`)
    expect(text).toContain('http://w/lots/2')
  })
})
