import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { UNIT_STATES } from '../../../../shared/lots'
import { wilsonInterval } from '../../../../shared/quality/proportion'
import { lotYield, type LotYieldInput, type StepRun } from '../../../../shared/quality/yieldStats'

const run = (unitId: string, stepId: string, attempt: number, pass: boolean): StepRun => ({
  unitId,
  stepId,
  attempt,
  result: pass ? 'pass' : 'fail',
})

// Common practice, no source, for every definition here (they follow DESIGN.md §7).
// Route wind → hipot → load, 5 units:
//   U1 passes all three first time, passed       U2 the same, shipped
//   U3 fails wind, passes wind on attempt 2 (rework), then hipot and load; passed
//   U4 passes wind, fails hipot; scrapped          U5 passes wind, still in progress
const lot: LotYieldInput = {
  stepIds: ['wind', 'hipot', 'load'],
  runs: [
    ...['U1', 'U2'].flatMap((u) => ['wind', 'hipot', 'load'].map((s) => run(u, s, 1, true))),
    run('U3', 'wind', 1, false),
    run('U3', 'wind', 2, true),
    run('U3', 'hipot', 1, true),
    run('U3', 'load', 1, true),
    run('U4', 'wind', 1, true),
    run('U4', 'hipot', 1, false),
    run('U5', 'wind', 1, true),
  ],
  units: [
    { unitId: 'U1', state: 'passed' },
    { unitId: 'U2', state: 'shipped' },
    { unitId: 'U3', state: 'passed' },
    { unitId: 'U4', state: 'scrapped' },
    { unitId: 'U5', state: 'in_progress' },
  ],
}

describe('lotYield', () => {
  it('computes step FPY, RTY, lot FPY, final yield and DPU for a hand-worked lot', () => {
    const y = lotYield(lot)
    // wind: first attempts U1–U5 = 5, first-attempt passes U1 U2 U4 U5 = 4 → 0.8
    expect(y.stepFpy.wind).toMatchObject({ passedFirst: 4, firstAttempts: 5, fpy: 0.8 })
    // hipot: first attempts U1–U4 = 4, passes U1 U2 U3 = 3 → 0.75
    expect(y.stepFpy.hipot).toMatchObject({ passedFirst: 3, firstAttempts: 4, fpy: 0.75 })
    // load: first attempts U1–U3 = 3, all pass → 1
    expect(y.stepFpy.load).toMatchObject({ passedFirst: 3, firstAttempts: 3, fpy: 1 })
    // 95 % Wilson interval of each step, as wilsonInterval gives it.
    expect(y.stepFpy.wind.interval).toEqual(wilsonInterval(4, 5))
    // RTY = 0.8 · 0.75 · 1 = 0.6
    expect(y.rty).toBeCloseTo(0.6, 12)
    // finished = U1 U2 U3 U4 = 4; first-pass = U1 U2 (U3 reworked, U4 failed) → 2 / 4
    expect(y.finished).toBe(4)
    expect(y.lotFpy).toBe(0.5)
    // passed = U1 U2 U3 → 3 / 4
    expect(y.finalYield).toBe(0.75)
    // defects = U3 wind + U4 hipot = 2; started = 5 → 0.4
    expect(y.started).toBe(5)
    expect(y.dpu).toBe(0.4)
  })

  it('counts only units with a run as started and leaves out steps nobody reached', () => {
    // Common practice, no source: a queued unit has not started; a step with no attempts has
    // no FPY and drops out of RTY rather than counting as 0 or 1.
    const y = lotYield({
      stepIds: ['wind', 'burn_in'],
      runs: [run('A', 'wind', 1, true), run('B', 'wind', 1, false)],
      units: [
        { unitId: 'A', state: 'in_progress' },
        { unitId: 'B', state: 'in_rework' },
        { unitId: 'C', state: 'queued' },
      ],
    })
    expect(y.started).toBe(2)
    expect(y.dpu).toBe(0.5)
    expect(y.stepFpy.burn_in).toEqual({
      passedFirst: 0,
      firstAttempts: 0,
      fpy: null,
      interval: { low: 0, high: 1 },
    })
    expect(y.rty).toBe(0.5)
    expect(y.finished).toBe(0)
    expect(y.lotFpy).toBeNull()
    expect(y.finalYield).toBeNull()
  })

  it('gives nulls, not NaN, for an empty lot', () => {
    expect(lotYield({ stepIds: ['wind'], runs: [], units: [] })).toMatchObject({
      rty: null,
      lotFpy: null,
      finalYield: null,
      dpu: null,
      finished: 0,
      started: 0,
    })
  })

  it('refuses an attempt number below 1', () => {
    expect(() => lotYield({ ...lot, runs: [run('U1', 'wind', 0, true)] })).toThrow(RangeError)
  })

  it('keeps every yield figure within [0, 1] on random lots', () => {
    const unitIds = ['U1', 'U2', 'U3', 'U4', 'U5', 'U6']
    const stepIds = ['wind', 'hipot', 'load']
    const runs = fc.array(
      fc.record({
        unitId: fc.constantFrom(...unitIds),
        stepId: fc.constantFrom(...stepIds),
        attempt: fc.integer({ min: 1, max: 3 }),
        result: fc.constantFrom('pass' as const, 'fail' as const),
      }),
      { maxLength: 40 },
    )
    const states = fc.array(fc.constantFrom(...UNIT_STATES), {
      minLength: unitIds.length,
      maxLength: unitIds.length,
    })
    fc.assert(
      fc.property(runs, states, (r, s) => {
        const units = unitIds.map((unitId, i) => ({ unitId, state: s[i] }))
        const y = lotYield({ runs: r, stepIds, units })
        const figures = [y.rty, y.lotFpy, y.finalYield]
        for (const step of Object.values(y.stepFpy)) figures.push(step.fpy)
        for (const f of figures) if (f !== null) expect(f).toBeGreaterThanOrEqual(0)
        for (const f of figures) if (f !== null) expect(f).toBeLessThanOrEqual(1)
        if (y.lotFpy !== null && y.finalYield !== null)
          expect(y.lotFpy).toBeLessThanOrEqual(y.finalYield)
        if (y.dpu !== null) expect(y.dpu).toBeGreaterThanOrEqual(0)
      }),
    )
  })
})
