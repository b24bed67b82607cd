import type { CheckValue } from '../../shared/recipes/evaluate'
import type { CheckDto, StepDto, WindingDto } from '../../shared/schemas/recipes'

/** A small seeded generator (mulberry32), so the demo shop is the same on every machine. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** What is physically true of one demo unit, from which its readings follow. */
export interface UnitTruth {
  /** Turns really wound on the secondary (the nominal, or a miscount). */
  secondaryTurns: number
  /** This core's AL relative to the nominal (ungapped ferrite: ±25 % is normal). */
  alFactor: number
  /** Force a failing reading on this step, by check key and value. */
  override?: Record<string, CheckValue>
}

const round = (v: number, decimals: number) => Math.round(v * 10 ** decimals) / 10 ** decimals

function typical(c: CheckDto, rnd: () => number): CheckValue {
  if (c.kind === 'boolean') return true
  if (c.kind === 'choice') return c.choices!.find((o) => o.isPass)!.value
  if (c.kind === 'text') return 'ok'
  const lo = c.lower ?? (c.upper !== null ? 0 : (c.nominal ?? 0))
  const hi = c.upper ?? (c.nominal ?? lo) * 1.1
  const centre =
    c.nominal ?? (c.lower !== null && c.upper === null ? c.lower * 1.05 : (lo + hi) / 2)
  const spread = (hi - lo) / 8
  return round(Math.min(hi, Math.max(lo, centre + (rnd() - 0.5) * 2 * spread)), c.decimals)
}

/**
 * Invented readings for a step of the demo recipes that agree with the physics: inductance is
 * AL·N² with this core's AL, the ratio test reads N_s/N_p of the real turns, and the input
 * current follows from an efficiency near 90 %. Anything else gets a typical in-limit value.
 */
export function demoReadings(
  step: StepDto,
  windings: WindingDto[],
  truth: UnitTruth,
  rnd: () => number,
): Record<string, CheckValue> {
  const values: Record<string, CheckValue> = {}
  const w = (name: string) => windings.find((x) => x.name === name)
  for (const c of step.checks.filter((c) => !c.derived)) values[c.key] = typical(c, rnd)
  const sec = w('secondary')
  const pa = w('primary A')
  if (step.stationKind === 'winding' && sec && pa) {
    const al = sec.alNanoHenry * 1e-9 * truth.alFactor
    const lPrimary = () => round(al * pa.nominalTurns ** 2 * 1e6 * (1 + (rnd() - 0.5) * 0.02), 1)
    if ('l_primary_a' in values) values.l_primary_a = lPrimary()
    if ('l_primary_b' in values) values.l_primary_b = lPrimary()
    values.l_secondary = round(al * truth.secondaryTurns ** 2 * 1e3, 2)
    const vp = values.ratio_v_primary as number
    values.ratio_v_secondary = round(
      ((vp * truth.secondaryTurns) / pa.nominalTurns) * (1 + (rnd() - 0.5) * 0.002),
      1,
    )
  }
  if (step.stationKind === 'load_test' && typeof values.vout === 'number') {
    const eff = 0.89 + rnd() * 0.02
    values.iin = round(
      ((values.vout as number) * (values.iout as number)) / ((values.vin as number) * eff),
      2,
    )
    if ('vout_no_load' in values)
      values.vout_no_load = round((values.vout as number) + 1 + rnd() * 2, 1)
  }
  return { ...values, ...truth.override }
}
