import { evaluateChecks } from '../../shared/recipes/evaluate'
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

/** A standard normal draw from two uniform ones (Box–Muller). */
export function gaussian(rnd: () => number): number {
  const u = Math.max(rnd(), Number.EPSILON)
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rnd())
}

/** What is physically true of one demo unit and of who measured it, from which its readings follow. */
export interface UnitTruth {
  /** Turns really wound on the secondary (the nominal, or a miscount). */
  secondaryTurns: number
  /**
   * This core's AL relative to the nominal: its core lot's own factor (ungapped ferrite: within
   * the ±25 % tolerance) times this core's scatter within the lot.
   */
  alFactor: number
  /** The bench's meter: inductances read this much high or low (e.g. 1.003 = +0.3 %). */
  meterFactor: number
  /** The person reading a voltmeter: a slight bias, in the reading's last digits (V). */
  readerBiasVolts: number
  /** Force these readings on this step (a failure the story needs), by check key. */
  override?: Record<string, CheckValue>
}

/** Typical values of checks with only an upper limit (leakage, ripple, temperature), by key. */
const TYPICAL_UPPER_ONLY: Record<string, { mean: number; sd: number }> = {
  hipot_leakage: { mean: 1.35, sd: 0.12 },
  ripple_pp: { mean: 1.6, sd: 0.18 },
  case_temp: { mean: 53, sd: 2.5 },
}

const round = (v: number, decimals: number) => Math.round(v * 10 ** decimals) / 10 ** decimals

/** An exact count (a check whose limits are one value, such as turns counted): never varies. */
export function isExactCount(c: Pick<CheckDto, 'kind' | 'lower' | 'upper'>): boolean {
  return c.kind === 'numeric' && c.lower !== null && c.lower === c.upper
}

/** A reading of a two-sided or one-sided numeric check, kept inside its limits. */
function typicalNumber(c: CheckDto, rnd: () => number): number {
  if (isExactCount(c)) return c.lower!
  const lo = c.lower ?? -Infinity
  const hi = c.upper ?? Infinity
  let mean: number
  let sd: number
  const known = TYPICAL_UPPER_ONLY[c.key]
  if (c.lower === null && c.upper !== null) {
    mean = known?.mean ?? c.upper * 0.4
    sd = known?.sd ?? c.upper * 0.04
  } else if (c.lower !== null && c.upper !== null) {
    const range = c.upper - c.lower
    // A set-point on an edge (test voltage, time held) is met with a little to spare.
    mean =
      c.nominal === null
        ? (c.lower + c.upper) / 2
        : c.nominal <= c.lower
          ? c.lower + range * 0.12
          : c.nominal >= c.upper
            ? c.upper - range * 0.12
            : c.nominal
    sd = range / 14
  } else {
    mean = c.nominal ?? c.lower! * 1.05
    sd = Math.abs(mean) * 0.01
  }
  for (let i = 0; i < 20; i++) {
    const v = round(mean + gaussian(rnd) * sd, c.decimals)
    if (v >= lo && v <= hi) return v
  }
  return round(Math.min(hi, Math.max(lo, mean)), c.decimals)
}

/** One draw of the typed readings of a step, following the unit's truth. */
function draw(
  step: StepDto,
  windings: readonly WindingDto[],
  truth: UnitTruth,
  rnd: () => number,
): Record<string, CheckValue> {
  const values: Record<string, CheckValue> = {}
  for (const c of step.checks.filter((c) => !c.derived)) {
    if (c.kind === 'boolean') values[c.key] = true
    else if (c.kind === 'choice') values[c.key] = c.choices!.find((o) => o.isPass)!.value
    else if (c.kind === 'text') values[c.key] = 'ok'
    else values[c.key] = typicalNumber(c, rnd)
  }
  const w = (name: string) => windings.find((x) => x.name === name)
  const decimalsOf = (key: string) => step.checks.find((c) => c.key === key)?.decimals ?? 2
  const sec = w('secondary')
  const pa = w('primary A')
  if (step.stationKind === 'winding' && sec && pa) {
    // L = AL·N² with this core's AL, read on this bench's meter with ±0.3 % (1σ) noise.
    const al = sec.alNanoHenry * 1e-9 * truth.alFactor * truth.meterFactor
    const read = (turns: number, scale: number, key: string) =>
      round(al * turns ** 2 * scale * (1 + gaussian(rnd) * 0.003), decimalsOf(key))
    if ('l_primary_a' in values) values.l_primary_a = read(pa.nominalTurns, 1e6, 'l_primary_a')
    if ('l_primary_b' in values) values.l_primary_b = read(pa.nominalTurns, 1e6, 'l_primary_b')
    if ('l_secondary' in values) values.l_secondary = read(truth.secondaryTurns, 1e3, 'l_secondary')
    // The ratio test reads N_s/N_p of the turns really wound, ±0.05 % and the reader's bias.
    const vp = values.ratio_v_primary as number
    values.ratio_v_secondary = round(
      ((vp * truth.secondaryTurns) / pa.nominalTurns) * (1 + gaussian(rnd) * 0.0005) +
        truth.readerBiasVolts,
      decimalsOf('ratio_v_secondary'),
    )
  }
  if (step.stationKind === 'load_test' && typeof values.vout === 'number') {
    // The input current follows from an efficiency near 90 %.
    const eff = 0.9 + gaussian(rnd) * 0.006
    values.vout = round((values.vout as number) + truth.readerBiasVolts, decimalsOf('vout'))
    values.iin = round(
      ((values.vout as number) * (values.iout as number)) / ((values.vin as number) * eff),
      decimalsOf('iin'),
    )
    if ('vout_no_load' in values)
      values.vout_no_load = round(
        (values.vout as number) + 1.5 + gaussian(rnd) * 0.4,
        decimalsOf('vout_no_load'),
      )
  }
  return { ...values, ...truth.override }
}

/**
 * The last value of every check series of the demo, by lot, step and check: what the next
 * reading must differ from. A series is a lot's values of one check in the order they were
 * recorded, as the statistics read it.
 */
export class SeriesMemory {
  private readonly last = new Map<string, number>()
  private key(lotId: string, checkId: string) {
    return `${lotId}:${checkId}`
  }
  get(lotId: string, checkId: string): number | undefined {
    return this.last.get(this.key(lotId, checkId))
  }
  set(lotId: string, checkId: string, value: number): void {
    this.last.set(this.key(lotId, checkId), value)
  }
}

/** The numeric results (typed and derived) of a draw that the statistics see, by check. */
function numericResults(
  step: StepDto,
  windings: readonly WindingDto[],
  values: Record<string, CheckValue>,
): { check: CheckDto; value: number }[] {
  const results = evaluateChecks(step.checks, values, windings)
  return step.checks
    .filter((c) => c.kind === 'numeric' && !isExactCount(c))
    .map((c) => ({ check: c, value: results[c.key]?.value }))
    .filter((r): r is { check: CheckDto; value: number } => typeof r.value === 'number')
}

/** How many draws a step gets to differ from the last values before the seed gives up. */
const MAX_DRAWS = 50

/**
 * Invented readings for a step of the demo recipes that agree with the physics: inductance is
 * AL·N² with this core's AL, the ratio test reads N_s/N_p of the real turns, and the input
 * current follows from an efficiency near 90 %; everything else is drawn around its nominal
 * with a realistic spread. No value (typed or derived, exact counts aside) repeats the last one
 * of its series: a draw that would is drawn again, and after MAX_DRAWS the seed stops.
 */
export function demoReadings(
  step: StepDto,
  windings: readonly WindingDto[],
  truth: UnitTruth,
  rnd: () => number,
  memory: SeriesMemory,
  lotId: string,
): Record<string, CheckValue> {
  for (let i = 0; i < MAX_DRAWS; i++) {
    const values = draw(step, windings, truth, rnd)
    const numeric = numericResults(step, windings, values)
    if (numeric.some((r) => memory.get(lotId, r.check.id) === r.value)) continue
    for (const r of numeric) memory.set(lotId, r.check.id, r.value)
    return values
  }
  throw new Error(`demo readings: ${step.name} repeats its last values after ${MAX_DRAWS} draws`)
}
