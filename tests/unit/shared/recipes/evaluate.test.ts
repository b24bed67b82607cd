import { describe, expect, it } from 'vitest'
import {
  derivedValue,
  evaluateChecks,
  judgeValue,
  overallVerdict,
} from '../../../../shared/recipes/evaluate'
import type { CheckDto, WindingDto } from '../../../../shared/schemas/recipes'

function check(over: Partial<CheckDto>): CheckDto {
  return {
    id: over.key ?? 'id',
    stepId: 's',
    position: 1,
    key: 'k',
    label: 'L',
    kind: 'numeric',
    unit: 'V',
    nominal: null,
    lower: null,
    upper: null,
    decimals: 2,
    choices: null,
    derived: null,
    derivedInputs: null,
    isKey: false,
    isForCustomers: true,
    ...over,
  }
}

const secondary: WindingDto = {
  id: 'w-sec',
  position: 3,
  name: 'secondary',
  nominalTurns: 92,
  alNanoHenry: 3000,
  alTolerancePercent: 25,
  coreAreaMm2: 178,
}
const primaryA: WindingDto = {
  ...secondary,
  id: 'w-pa',
  position: 1,
  name: 'primary A',
  nominalTurns: 6,
}

describe('judgeValue', () => {
  it('passes values on or inside inclusive limits and fails outside', () => {
    const c = check({ lower: 9.9, upper: 10.1 })
    expect(judgeValue(c, 9.9)).toBe('pass')
    expect(judgeValue(c, 10.1)).toBe('pass')
    expect(judgeValue(c, 10.11)).toBe('fail')
    expect(judgeValue(c, null)).toBe('missing')
    expect(judgeValue(check({ upper: 5 }), -100)).toBe('pass')
  })

  it('judges boolean, text and choice checks', () => {
    expect(judgeValue(check({ kind: 'boolean' }), true)).toBe('pass')
    expect(judgeValue(check({ kind: 'boolean' }), false)).toBe('fail')
    expect(judgeValue(check({ kind: 'text' }), '  ')).toBe('missing')
    const choice = check({
      kind: 'choice',
      choices: [
        { value: 'ok', isPass: true },
        { value: 'bad', isPass: false },
      ],
    })
    expect(judgeValue(choice, 'ok')).toBe('pass')
    expect(judgeValue(choice, 'bad')).toBe('fail')
    expect(judgeValue(choice, 'other')).toBe('fail')
  })
})

describe('derived checks', () => {
  const lSec = check({ key: 'l_sec', unit: 'mH', lower: 19, upper: 31.8 })
  const vp = check({ key: 'vp', unit: 'V' })
  const vs = check({ key: 'vs', unit: 'V' })
  const dev = check({
    key: 'dev',
    unit: 'turns',
    lower: -0.5,
    upper: 0.5,
    derived: 'turn_deviation',
    derivedInputs: { inductance: 'l_sec', winding: 'w-sec' },
  })
  const ratio = check({
    key: 'ratio',
    unit: 'turns',
    lower: 91.5,
    upper: 92.5,
    derived: 'secondary_turns_from_ratio',
    derivedInputs: { primaryWinding: 'w-pa', primaryVolts: 'vp', secondaryVolts: 'vs' },
  })

  it('converts units: an inductance in mH feeds the AL formula in henry', () => {
    // L = AL·N² (common practice): 90 turns on AL 3000 nH → 24.3 mH, so the deviation is −2 turns.
    const results = evaluateChecks([lSec, dev], { l_sec: 24.3 }, [secondary])
    expect(results.dev!.value as number).toBeCloseTo(-2, 9)
    expect(results.dev!.verdict).toBe('fail')
    expect(results.l_sec!.verdict).toBe('pass')
    expect(overallVerdict(results)).toBe('fail')
  })

  it('counts secondary turns from the voltage ratio', () => {
    // N_s = N_p·V_s/V_p (common practice): 6 × 140 / 10 = 84 turns, a miscount of 8.
    const results = evaluateChecks([vp, vs, ratio], { vp: 10, vs: 140 }, [primaryA])
    expect(results.ratio!.value as number).toBeCloseTo(84, 9)
    expect(results.ratio!.verdict).toBe('fail')
  })

  it('gives ratios in % when the derived check is in %', () => {
    const checks = ['vin', 'iin', 'vout', 'iout'].map((key) =>
      check({ key, unit: key.startsWith('i') ? 'A' : 'V' }),
    )
    const eff = check({
      key: 'eff',
      unit: '%',
      lower: 85,
      derived: 'efficiency',
      derivedInputs: { vin: 'vin', iin: 'iin', vout: 'vout', iout: 'iout' },
    })
    // Common practice, no source: 48 V × 2.5 A in, 12 V × 9 A out → 90 %.
    const results = evaluateChecks([...checks, eff], { vin: 48, iin: 2.5, vout: 12, iout: 9 }, [])
    expect(results.eff!.value as number).toBeCloseTo(90, 9)
    expect(results.eff!.verdict).toBe('pass')
  })

  it('is missing, not an error, while an input is empty or out of domain', () => {
    expect(evaluateChecks([lSec, dev], {}, [secondary]).dev!.verdict).toBe('missing')
    const ctx = {
      checksByKey: new Map([[lSec.key, lSec]]),
      values: { l_sec: -1 },
      windings: [secondary],
    }
    expect(derivedValue(dev, ctx)).toBeNull()
  })
})
