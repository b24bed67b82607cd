import { describe, expect, it } from 'vitest'
import { evaluateChecks } from '../../../../shared/recipes/evaluate'
import type { CheckDto, StepDto, WindingDto } from '../../../../shared/schemas/recipes'
import { DEMO_PRODUCTS } from '../../../../server/seed/demoProducts'
import {
  demoReadings,
  isExactCount,
  seededRandom,
  SeriesMemory,
} from '../../../../server/seed/demoReadings'
import type { UnitTruth } from '../../../../server/seed/demoReadings'

// The demo recipes as the API returns them: ids are the names, so derived inputs that name a
// winding find it.
const fp24 = DEMO_PRODUCTS.find((p) => p.code === 'FP24')!.revisions.find((r) => r.letter === 'B')!
const windings: WindingDto[] = fp24.windings.map((w, i) => ({
  id: w.name,
  position: i + 1,
  name: w.name,
  nominalTurns: w.nominalTurns,
  alNanoHenry: w.alNanoHenry,
  alTolerancePercent: w.alTolerancePercent ?? 25,
  coreAreaMm2: w.coreAreaMm2 ?? null,
}))
const steps: StepDto[] = fp24.steps.map((s, i) => ({
  id: s.name,
  position: i + 1,
  name: s.name,
  stationKind: s.stationKind,
  instructions: s.instructions ?? '',
  safetyNote: s.safetyNote ?? '',
  requiresSignoff: s.requiresSignoff ?? false,
  checks: s.checks.map((c, k): CheckDto => ({
    id: `${s.name}:${c.key}`,
    stepId: s.name,
    position: k + 1,
    key: c.key,
    label: c.label,
    kind: c.kind,
    unit: c.unit ?? null,
    nominal: c.nominal ?? null,
    lower: c.lower ?? null,
    upper: c.upper ?? null,
    decimals: c.decimals ?? 2,
    choices: c.choices ?? null,
    isKey: false,
    isForCustomers: true,
    derived: c.derived ?? null,
    derivedInputs: c.derivedInputs ?? null,
  })),
}))
const winding = steps.find((s) => s.stationKind === 'winding')!
const loadTest = steps.find((s) => s.stationKind === 'load_test')!

const truth = (over: Partial<UnitTruth> = {}): UnitTruth => ({
  secondaryTurns: 92,
  alFactor: 1,
  meterFactor: 1,
  readerBiasVolts: 0,
  ...over,
})

/** `count` draws of a step for one lot, with one generator and one memory. */
function series(step: StepDto, count: number, seed: number, t = truth()) {
  const rnd = seededRandom(seed)
  const memory = new SeriesMemory()
  return Array.from({ length: count }, () => demoReadings(step, windings, t, rnd, memory, 'lot'))
}

describe('demo readings', () => {
  it('are the same for the same seed and differ for another', () => {
    expect(series(winding, 20, 7)).toEqual(series(winding, 20, 7))
    expect(series(winding, 20, 7)).not.toEqual(series(winding, 20, 8))
  })

  it('never repeat the last value of a series, typed or derived; exact counts stay exact', () => {
    for (const step of [winding, loadTest]) {
      const draws = series(step, 60, 11)
      const results = draws.map((v) => evaluateChecks(step.checks, v, windings))
      for (const c of step.checks.filter((c) => c.kind === 'numeric')) {
        const values = results.map((r) => r[c.key]!.value as number)
        if (isExactCount(c)) {
          expect(new Set(values), c.key).toEqual(new Set([c.lower]))
          continue
        }
        const repeats = values.filter((v, i) => i > 0 && v === values[i - 1])
        expect(repeats, c.key).toEqual([])
      }
    }
  })

  it('pass every check of a healthy unit', () => {
    for (const step of steps)
      for (const v of series(step, 30, 3)) {
        const results = evaluateChecks(step.checks, v, windings)
        const failing = Object.entries(results).filter(([, r]) => r.verdict !== 'pass')
        expect(
          failing.map(([k]) => k),
          step.name,
        ).toEqual([])
      }
  })

  it('follow the physics: L = AL·N², the ratio test reads the turns really wound', () => {
    // FP24: AL 3000 nH/turn², 92 secondary turns → L = 3000e-9 × 92² = 25.39 mH (from the
    // recipe's own figures, L = AL·N², common practice); 6 % high AL → 26.91 mH.
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length
    const at = (t: UnitTruth, key: string) =>
      mean(series(winding, 40, 5, t).map((v) => v[key] as number))
    expect(at(truth(), 'l_secondary')).toBeCloseTo(25.39, 0)
    expect(at(truth({ alFactor: 1.06 }), 'l_secondary')).toBeCloseTo(26.91, 0)
    // 10 V on 6 primary turns, 94 secondary turns wound → 156.7 V (N_s/N_p × V_p).
    expect(at(truth({ secondaryTurns: 94 }), 'ratio_v_secondary')).toBeCloseTo(156.7, 0)
  })

  it('take a forced failing reading as the story gives it', () => {
    const [v] = series(steps[2]!, 1, 1, truth({ override: { hipot_outcome: 'breakdown' } }))
    expect(v!.hipot_outcome).toBe('breakdown')
  })
})
