// Alert episodes (issue 19, point 2): a lot's step and check goes out of control at its first
// broken run rule and stays so until enough points in a row break none. One episode is one
// alert and one e-mail, however many rules its points break. Pure: the alerts worker feeds in
// the series it read and stores what `planEpisodes` says.
import { runRuleViolations } from './runRules'
import type { RuleViolation } from './runRules'
import { capability, median } from './spc'

/**
 * Run rules are judged only from this many values on: rule 4 needs 8 points, and a sigma from
 * fewer than 7 moving ranges swings too much to be worth an e-mail (our choice; no source).
 */
export const RUN_RULE_MIN_POINTS = 8

/**
 * A series is back in control after this many points in a row at which no rule is broken: the
 * longest rule window (rule 4, 8 points), so every window that could still hold a point of the
 * episode has passed. Our choice; no source.
 */
export const RE_ARM_POINTS = 8

/** The σ-multiple beyond which each Western Electric rule counts a point (rule 4: the centre). */
export const RULE_ZONE_SIGMAS: Record<1 | 2 | 3 | 4, number> = { 1: 3, 2: 2, 3: 1, 4: 0 }

/** Each rule's window and how many of its points must lie beyond the zone on one side. */
const RULE_WINDOWS: Record<1 | 2 | 3 | 4, { window: number; needed: number }> = {
  1: { window: 1, needed: 1 },
  2: { window: 3, needed: 2 },
  3: { window: 5, needed: 4 },
  4: { window: 8, needed: 8 },
}

/**
 * The smallest departure from the centre worth an alert on a turn count: half a turn. A wound
 * coil has a whole number of turns, so a reading less than half a turn off rounds to the
 * nominal count (DESIGN.md §7 flags a deviation only when it rounds to another whole turn); a
 * steady shift of a few hundredths of a turn is the meter or the reader, nothing a lead can
 * rewind. Common practice, no source.
 */
export const TURN_MIN_SHIFT = 0.5

/** What the practical minimum shift needs to know of a check. */
export interface ShiftCheck {
  unit: string | null
  derived: string | null
}

const TURN_COUNT_FORMULAS = [
  'turns_from_inductance',
  'turn_deviation',
  'secondary_turns_from_ratio',
]

/**
 * The smallest departure from the centre a lead can act on, in the check's unit: TURN_MIN_SHIFT
 * for a turn count (read or derived), else 0 (every departure the rules flag counts).
 */
export function practicalShift(check: ShiftCheck): number {
  const isTurns =
    check.unit === 'turns' ||
    (check.derived !== null && TURN_COUNT_FORMULAS.includes(check.derived))
  return isTurns ? TURN_MIN_SHIFT : 0
}

/** Whether a series can be judged: enough points and some spread. */
export type SeriesJudgement = 'judged' | 'too_few_points' | 'no_spread'

/** What the chart and the API say of a series that cannot be judged. */
export const NOT_ENOUGH_VARIATION = 'not enough variation to judge'

/** The centre line and within sigma a series is judged against, or why it is not judged. */
export interface SeriesBasis {
  judgement: SeriesJudgement
  centre: number | null
  centreSource: 'nominal' | 'lot_median'
  /** Within sigma: average moving range / d2 (1.128); null when not judged. */
  sigma: number | null
  /**
   * A point counts towards a rule only this far from the centre or more, whatever σ says (see
   * `practicalShift`); 0 leaves the rules as they are.
   */
  minShift: number
}

/**
 * A moving range this small relative to the values is rounding noise of equal readings (a
 * derived value computed from identical inputs), not spread. Common practice, no source.
 */
const RELATIVE_NOISE = 1e-9

/**
 * Centre (the nominal when given, else the series median, which a run of bad units does not
 * drag towards itself) and within sigma of a series in build order. Fewer than RUN_RULE_MIN_POINTS values, or no spread (every value equal, or a sigma
 * that is rounding noise), is not judged: no rule can fire on it.
 */
export function seriesBasis(
  values: readonly number[],
  nominal: number | null,
  minShift = 0,
): SeriesBasis {
  const centreSource = nominal === null ? 'lot_median' : 'nominal'
  if (values.length < RUN_RULE_MIN_POINTS)
    return { judgement: 'too_few_points', centre: null, centreSource, sigma: null, minShift }
  const { mean, sdWithin } = capability(values)
  const scale = Math.max(1, ...values.map(Math.abs))
  const isFlat = values.every((v) => v === values[0])
  if (isFlat || mean === null || sdWithin === null || !(sdWithin > RELATIVE_NOISE * scale))
    return { judgement: 'no_spread', centre: null, centreSource, sigma: null, minShift }
  return {
    judgement: 'judged',
    centre: nominal ?? median(values)!,
    centreSource,
    sigma: sdWithin,
    minShift,
  }
}

/** One out-of-control stretch of a series, by 0-based build-order index. */
export interface Episode {
  /** The index of its first broken rule. */
  start: number
  /** The index of its latest broken rule. */
  last: number
  /** Every rule broken from `start` to `last`, ascending. */
  rules: (1 | 2 | 3 | 4)[]
  /** RE_ARM_POINTS points after `last` broke no rule: the series is back in control. */
  isOver: boolean
  /** The first index a new episode may start at: `last` + RE_ARM_POINTS + 1. */
  rearmAt: number
}

/**
 * Whether the rule broken at `hit.index` still breaks when each point it counts must also lie
 * at least `minShift` from the centre, besides beyond its kσ zone.
 */
function isPractical(
  values: readonly number[],
  hit: RuleViolation,
  centre: number,
  sigma: number,
  minShift: number,
): boolean {
  if (!(minShift > 0)) return true
  const { window, needed } = RULE_WINDOWS[hit.rule]
  const zone = RULE_ZONE_SIGMAS[hit.rule] * sigma
  const counts = (d: number) => d > zone && d >= minShift
  const slice = values.slice(hit.index + 1 - window, hit.index + 1)
  const above = slice.filter((v) => counts(v - centre)).length
  const below = slice.filter((v) => counts(centre - v)).length
  return above >= needed || below >= needed
}

/**
 * The first episode at or after `from`: it starts at the first broken rule there and takes in
 * every later one until RE_ARM_POINTS points in a row break none. A rule broken only by points
 * nearer the centre than `minShift` does not count. Null when none is broken.
 */
export function nextEpisode(
  values: readonly number[],
  centre: number,
  sigma: number,
  from = 0,
  minShift = 0,
): Episode | null {
  const hits = runRuleViolations(values, centre, sigma).filter(
    (v) => v.index >= from && isPractical(values, v, centre, sigma, minShift),
  )
  if (!hits.length) return null
  const start = hits[0]!.index
  let last = start
  const rules = new Set<1 | 2 | 3 | 4>()
  for (const h of hits) {
    // Fewer than RE_ARM_POINTS clean points between two hits: still the same episode.
    if (h.index - last - 1 >= RE_ARM_POINTS) break
    last = h.index
    rules.add(h.rule)
  }
  return {
    start,
    last,
    rules: [...rules].sort((a, b) => a - b),
    isOver: values.length - 1 - last >= RE_ARM_POINTS,
    rearmAt: last + RE_ARM_POINTS + 1,
  }
}

/** What is stored of a series: its running episode (if any) and where it was last re-armed. */
export interface SeriesState {
  /** The start index of the stored episode that is not yet back in control. */
  activeStart: number | null
  /** Where the last stored episode ended: no new episode starts before this index. */
  armedFrom: number
}

/** What to store after judging a series again. */
export interface EpisodePlan {
  /**
   * The stored running episode as it stands now; null when it was stored but its rules no
   * longer break (the centre and sigma moved with new points): it ends here, re-armed at the
   * series' end. Undefined when no episode was running.
   */
  active?: Episode | null
  /** Episodes to raise, oldest first; only the last may still be running. */
  raise: Episode[]
}

/**
 * Judges a series against what was stored of it: the running episode grows (more rules, a later
 * last point) or ends once back in control, and every episode after the re-arm point is new.
 * A series that cannot be judged changes nothing.
 */
export function planEpisodes(
  values: readonly number[],
  basis: SeriesBasis,
  state: SeriesState,
): EpisodePlan {
  if (basis.judgement !== 'judged' || basis.centre === null || basis.sigma === null)
    return { raise: [] }
  const { centre, sigma, minShift } = basis
  const plan: EpisodePlan = { raise: [] }
  let from = state.armedFrom
  if (state.activeStart !== null) {
    const now = nextEpisode(values, centre, sigma, state.activeStart, minShift)
    plan.active = now
    if (!now || !now.isOver) return plan
    from = now.rearmAt
  }
  for (;;) {
    const next = nextEpisode(values, centre, sigma, from, minShift)
    if (!next) return plan
    plan.raise.push(next)
    if (!next.isOver) return plan
    from = next.rearmAt
  }
}

/** One value of a check, in build order, with where and by whom it was made. */
export interface EpisodePoint {
  serial: string
  value: number
  /** The station's name, e.g. "Winding bench 2". */
  station: string | null
  operator: string | null
}

/** How an episode reads for a lead: which side, how far, how many, where and by whom. */
export interface EpisodeReading {
  side: 'above' | 'below'
  /** Points in the window beyond the episode's zone on its side. */
  outCount: number
  /** The last points up to the episode's latest broken rule (at most RE_ARM_POINTS). */
  window: EpisodePoint[]
  /** Mean distance of those points from the centre, in the check's unit (positive). */
  shift: number
  /** The station every one of those points was made at, or null when they differ. */
  station: string | null
  /** The operator who made every one of them, or null when they differ. */
  operator: string | null
}

function shared(values: (string | null)[]): string | null {
  const first = values[0] ?? null
  return first !== null && values.every((v) => v === first) ? first : null
}

/**
 * Reads an episode for the alert text: the window of the last RE_ARM_POINTS points up to its
 * latest broken rule, the points there beyond the episode's widest zone (rule 1: 3σ, rule 2:
 * 2σ, rule 3: 1σ, rule 4: the centre; never nearer than `minShift`) on the side most of them
 * fall, their mean distance from the centre, and the station and operator they share.
 */
export function readEpisode(
  points: readonly EpisodePoint[],
  episode: Episode,
  centre: number,
  sigma: number,
  minShift = 0,
): EpisodeReading {
  const window = points.slice(Math.max(0, episode.last + 1 - RE_ARM_POINTS), episode.last + 1)
  const widest = Math.min(...episode.rules.map((r) => RULE_ZONE_SIGMAS[r])) * sigma
  const beyond = (d: number) => d > widest && d >= minShift
  const above = window.filter((p) => beyond(p.value - centre))
  const below = window.filter((p) => beyond(centre - p.value))
  const side = above.length >= below.length ? 'above' : 'below'
  const out = side === 'above' ? above : below
  const shift = out.reduce((s, p) => s + Math.abs(p.value - centre), 0) / Math.max(1, out.length)
  return {
    side,
    outCount: out.length,
    window: window.map((p) => ({ ...p })),
    shift,
    station: shared(out.map((p) => p.station)),
    operator: shared(out.map((p) => p.operator)),
  }
}
