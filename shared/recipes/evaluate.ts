import { efficiency, loadRegulation, ripplePercent } from '../converter'
import {
  secondaryTurnsFromRatio,
  turnDeviation,
  turnsFromInductance,
  windingBalance,
} from '../magnetics'
import type { CheckDto, WindingDto } from '../schemas/recipes'
import { fromSi, toSi } from '../units'
import type { Unit } from '../units'
import { DERIVED_FORMULAS } from '../recipeDefinitions'

export type CheckValue = number | boolean | string | null
export type Verdict = 'pass' | 'fail' | 'missing'

type Judged = Pick<CheckDto, 'kind' | 'lower' | 'upper' | 'choices'>

/**
 * Pass or fail of one value against its check. Limits are inclusive (a value on a limit passes);
 * an empty limit is no limit. A boolean check passes when ticked; a text check passes once filled.
 */
export function judgeValue(check: Judged, value: CheckValue): Verdict {
  switch (check.kind) {
    case 'numeric': {
      if (typeof value !== 'number' || !Number.isFinite(value)) return 'missing'
      const isLow = check.lower !== null && value < check.lower
      const isHigh = check.upper !== null && value > check.upper
      return isLow || isHigh ? 'fail' : 'pass'
    }
    case 'boolean':
      return typeof value !== 'boolean' ? 'missing' : value ? 'pass' : 'fail'
    case 'text':
      return typeof value === 'string' && value.trim() !== '' ? 'pass' : 'missing'
    case 'choice': {
      if (typeof value !== 'string' || value === '') return 'missing'
      return check.choices?.find((o) => o.value === value)?.isPass ? 'pass' : 'fail'
    }
  }
}

export interface DerivedContext {
  checksByKey: ReadonlyMap<string, CheckDto>
  values: Readonly<Record<string, CheckValue>>
  windings: readonly WindingDto[]
}

/** The SI value of an input check, or null when it is not filled or has no unit. */
function siInput(ctx: DerivedContext, key: string | undefined): number | null {
  const check = key ? ctx.checksByKey.get(key) : undefined
  const value = key ? ctx.values[key] : undefined
  if (!check?.unit || typeof value !== 'number' || !Number.isFinite(value)) return null
  return toSi(value, check.unit)
}

function compute(check: CheckDto, ctx: DerivedContext): number | null {
  const inputs = check.derivedInputs ?? {}
  const winding = (name: string) => ctx.windings.find((w) => w.id === inputs[name])
  const v = (name: string) => siInput(ctx, inputs[name])
  switch (check.derived) {
    case 'turns_from_inductance': {
      const w = winding('winding')
      const l = v('inductance')
      return w && l !== null ? turnsFromInductance(l, w.alNanoHenry) : null
    }
    case 'turn_deviation': {
      const w = winding('winding')
      const l = v('inductance')
      return w && l !== null
        ? turnDeviation({
            nominalTurns: w.nominalTurns,
            inductanceH: l,
            alNanoHenry: w.alNanoHenry,
          }).deviation
        : null
    }
    case 'secondary_turns_from_ratio': {
      const w = winding('primaryWinding')
      const vp = v('primaryVolts')
      const vs = v('secondaryVolts')
      return w && vp !== null && vs !== null
        ? secondaryTurnsFromRatio(w.nominalTurns, vp, vs)
        : null
    }
    case 'efficiency': {
      const [vin, iin, vout, iout] = ['vin', 'iin', 'vout', 'iout'].map(v)
      return vin !== null && iin !== null && vout !== null && iout !== null
        ? efficiency({ vin, iin, vout, iout })
        : null
    }
    case 'load_regulation': {
      const [a, b] = ['vNoLoad', 'vFullLoad'].map(v)
      return a !== null && b !== null ? loadRegulation(a, b) / 100 : null
    }
    case 'ripple_percent': {
      const [r, out] = ['ripple', 'vout'].map(v)
      return r !== null && out !== null ? ripplePercent(r, out) / 100 : null
    }
    case 'winding_balance': {
      const [a, b] = ['inductanceA', 'inductanceB'].map(v)
      return a !== null && b !== null ? windingBalance(a, b) / 100 : null
    }
    default:
      return null
  }
}

/**
 * The value of a derived check in its own unit (a ratio in % when the unit is %), or null when an
 * input is missing or out of the formula's domain. Counts (turns) are returned as they are.
 */
export function derivedValue(check: CheckDto, ctx: DerivedContext): number | null {
  if (!check.derived) return null
  try {
    const si = compute(check, ctx)
    if (si === null || !Number.isFinite(si)) return null
    const quantity = DERIVED_FORMULAS[check.derived].quantity
    return check.unit && quantity !== 'count' ? fromSi(si, check.unit as Unit) : si
  } catch (err) {
    if (err instanceof RangeError) return null
    throw err
  }
}

export interface CheckResult {
  value: CheckValue
  verdict: Verdict
  isDerived: boolean
}

/**
 * Judges every check of a step: typed values first, then derived ones computed from them. The
 * Floor shows this as the operator types and the server stores the same result.
 */
export function evaluateChecks(
  checks: readonly CheckDto[],
  typed: Readonly<Record<string, CheckValue>>,
  windings: readonly WindingDto[],
): Record<string, CheckResult> {
  const checksByKey = new Map(checks.map((c) => [c.key, c]))
  const values: Record<string, CheckValue> = { ...typed }
  const out: Record<string, CheckResult> = {}
  for (const c of checks.filter((c) => !c.derived)) {
    const value = typed[c.key] ?? null
    out[c.key] = { value, verdict: judgeValue(c, value), isDerived: false }
  }
  for (const c of checks.filter((c) => c.derived)) {
    const value = derivedValue(c, { checksByKey, values, windings })
    values[c.key] = value
    out[c.key] = { value, verdict: judgeValue(c, value), isDerived: true }
  }
  return out
}

/** The step's overall verdict: fail when any check fails, missing when any is unfilled. */
export function overallVerdict(results: Readonly<Record<string, CheckResult>>): Verdict {
  const verdicts = Object.values(results).map((r) => r.verdict)
  if (verdicts.includes('fail')) return 'fail'
  if (verdicts.includes('missing')) return 'missing'
  return 'pass'
}
