import { describe, expect, it } from 'vitest'
import {
  NOT_ENOUGH_VARIATION,
  RE_ARM_POINTS,
  TURN_MIN_SHIFT,
  nextEpisode,
  planEpisodes,
  practicalShift,
  readEpisode,
  seriesBasis,
} from '../../../../shared/quality/episodes'
import type { EpisodePoint } from '../../../../shared/quality/episodes'

const TOL = 9

/** Alternating 10.0 / 10.2: moving range 0.2 each, so σ = 0.2 / 1.128 = 0.1773 (d2 for n = 2). */
const calm = (n: number) => Array.from({ length: n }, (_, i) => (i % 2 ? 10.2 : 10))

const points = (values: number[], station = (i: number) => `Bench ${i}`): EpisodePoint[] =>
  values.map((value, i) => ({
    serial: `U${String(i + 1).padStart(2, '0')}`,
    value,
    station: station(i),
    operator: 'Ann Ode',
  }))

describe('seriesBasis', () => {
  it('judges nothing below 8 points, the longest run-rule window', () => {
    // Western Electric rule 4 needs 8 points in a row (Western Electric, Statistical Quality
    // Control Handbook, 1956, part A section 1-B; Montgomery, Introduction to SQC, §5.3.6).
    expect(seriesBasis(calm(7), 10.1)).toMatchObject({ judgement: 'too_few_points', sigma: null })
    expect(seriesBasis(calm(8), 10.1).judgement).toBe('judged')
  })

  it('judges nothing without spread: equal values, or a sigma that is rounding noise', () => {
    expect(seriesBasis([25.4, 25.4, 25.4, 25.4, 25.4, 25.4, 25.4, 25.4, 25.4], 25).judgement).toBe(
      'no_spread',
    )
    // A derived value computed from equal readings may differ in the last bit (constructed).
    const noisy = [92, 92.00000000000001, 92, 92.00000000000001, 92, 92, 92, 92.00000000000001]
    expect(seriesBasis(noisy, 92).judgement).toBe('no_spread')
    expect(NOT_ENOUGH_VARIATION).toBe('not enough variation to judge')
  })

  it('takes the nominal as centre when given, else the median, and σ = MR̄ / 1.128', () => {
    // d2 = 1.128 for moving ranges of 2 (NIST/SEMATECH e-Handbook §6.3.2, constants table).
    const b = seriesBasis(calm(10), 10.1)
    expect(b).toMatchObject({ judgement: 'judged', centre: 10.1, centreSource: 'nominal' })
    expect(b.sigma).toBeCloseTo(0.2 / 1.128, TOL)
    const m = seriesBasis(calm(10), null)
    expect(m.centreSource).toBe('lot_median')
    expect(m.centre).toBeCloseTo(10.1, TOL) // arithmetic: five 10.0 and five 10.2
    // A run of bad units barely moves the median (constructed: 8 calm values, 4 at 15; the 6th
    // and 7th of the 12 sorted are both 10.2), where the mean would move to 11.73.
    expect(seriesBasis([...calm(8), 15, 15, 15, 15], null).centre).toBeCloseTo(10.2, TOL)
  })
})

describe('nextEpisode', () => {
  // Constructed: 10 calm points, then 6 at 11.0 (0.9 above the centre 10.1), then 10 calm.
  // σ from the whole series: moving ranges 0.2 × 17, 0.8 + 1.0 at the jumps in and out, and 0
  // within the run: MR̄ = (17·0.2 + 0.8 + 0.8) / 25 = 5.0 / 25 = 0.2 → σ = 0.1773, 3σ = 0.532.
  const shifted = [...calm(10), 11, 11, 11, 11, 11, 11, ...calm(10)]
  const sigmaOf = (v: number[]) => seriesBasis(v, 10.1).sigma!

  it('gathers every rule the run breaks into one episode, from its first broken rule', () => {
    const sigma = sigmaOf(shifted)
    const e = nextEpisode(shifted, 10.1, sigma)!
    // Each point at 11.0 is beyond 3σ (rule 1); two of three beyond 2σ (rule 2) from the
    // second; four of five beyond 1σ (rule 3) from the fourth. Rule 4 needs 8 on one side.
    // The first calm point after the run still ends windows that meet rules 2 and 3 (two of
    // its three, four of its five points are at 11.0): the last hit is index 16.
    expect(e.start).toBe(10)
    expect(e.last).toBe(16)
    expect(e.rules).toEqual([1, 2, 3])
    // 9 calm points follow the last hit: ≥ 8, back in control; re-armed from index 25.
    expect(e.isOver).toBe(true)
    expect(e.rearmAt).toBe(16 + RE_ARM_POINTS + 1)
  })

  it('keeps an episode running until 8 points in a row break no rule', () => {
    // The last hit is index 13 (rule 2: two of indexes 11–13 beyond 2σ), so 6 clean points follow.
    const running = [...calm(10), 11, 11, 11, ...calm(7)]
    const e = nextEpisode(running, 10.1, sigmaOf(running))!
    expect(e.last).toBe(13)
    expect(e.isOver).toBe(false)
    const more = [...running, 10, 10.2]
    expect(nextEpisode(more, 10.1, sigmaOf(more))!.isOver).toBe(true)
  })

  it('joins hits fewer than 8 clean points apart, and splits them 8 or more apart', () => {
    const near = [...calm(10), 12, ...calm(7), 12, ...calm(9)]
    const sigma = sigmaOf(near)
    const one = nextEpisode(near, 10.1, sigma)!
    expect([one.start, one.last]).toEqual([10, 18])
    const far = [...calm(10), 12, ...calm(8), 12, ...calm(9)]
    const first = nextEpisode(far, 10.1, sigmaOf(far))!
    expect([first.start, first.last, first.isOver]).toEqual([10, 10, true])
    const second = nextEpisode(far, 10.1, sigmaOf(far), first.rearmAt)!
    expect(second.start).toBe(19)
  })
})

describe('planEpisodes', () => {
  const shifted = [...calm(10), 11, 11, 11, 11, 11, 11, ...calm(10)]
  const basis = seriesBasis(shifted, 10.1)

  it('raises one episode for a run that several rules flag', () => {
    const plan = planEpisodes(shifted, basis, { activeStart: null, armedFrom: 0 })
    expect(plan.active).toBeUndefined()
    expect(plan.raise).toHaveLength(1)
    expect(plan.raise[0]!.rules).toEqual([1, 2, 3])
  })

  it('raises nothing more for an episode already stored, and says when it is over', () => {
    const plan = planEpisodes(shifted, basis, { activeStart: 10, armedFrom: 0 })
    expect(plan.raise).toEqual([])
    expect(plan.active).toMatchObject({ start: 10, isOver: true, rearmAt: 25 })
    // Re-armed at 25, the same points raise nothing again.
    expect(planEpisodes(shifted, basis, { activeStart: null, armedFrom: 25 }).raise).toEqual([])
  })

  it('raises a new episode once re-armed and out of control again', () => {
    const again = [...shifted, 11, 11, 11]
    const plan = planEpisodes(again, seriesBasis(again, 10.1), { activeStart: null, armedFrom: 25 })
    expect(plan.raise.map((e) => e.start)).toEqual([26])
  })

  it('ends a stored episode whose rules no longer break', () => {
    const plan = planEpisodes(calm(20), seriesBasis(calm(20), 10.1), {
      activeStart: 3,
      armedFrom: 0,
    })
    expect(plan).toEqual({ active: null, raise: [] })
  })

  it('does nothing with a series it cannot judge', () => {
    const flat = Array.from({ length: 20 }, () => 5)
    expect(planEpisodes(flat, seriesBasis(flat, 4), { activeStart: null, armedFrom: 0 })).toEqual({
      raise: [],
    })
  })
})

describe('readEpisode', () => {
  it('counts the points beyond the zone, their side, size, and the bench they share', () => {
    // Constructed: 20 calm points, then 6 at 12.1 (2 above 10.1) made at Bench 2, then 2 calm.
    const values = [...calm(20), 12.1, 12.1, 12.1, 12.1, 12.1, 12.1, 10, 10.2]
    const pts = points(values, (i) => (i >= 20 && i < 26 ? 'Bench 2' : 'Bench 1'))
    const basis = seriesBasis(values, 10.1)
    const e = nextEpisode(values, 10.1, basis.sigma!)!
    const r = readEpisode(pts, e, 10.1, basis.sigma!)
    // The window: the 8 points ending at the last hit (index 26, where rules 2 and 3 still
    // meet their windows), i.e. indexes 19–26; U27 (10.0) is not beyond 1σ and not counted.
    expect(r.window.map((p) => p.serial)).toEqual([
      'U20',
      'U21',
      'U22',
      'U23',
      'U24',
      'U25',
      'U26',
      'U27',
    ])
    expect(r).toMatchObject({ side: 'above', outCount: 6, station: 'Bench 2', operator: 'Ann Ode' })
    expect(r.shift).toBeCloseTo(2, TOL) // 12.1 − 10.1, arithmetic
  })

  it('names no bench when the points come from several', () => {
    const values = [...calm(20), 12.1, 12.1, 12.1, 12.1]
    const pts = points(values, (i) => `Bench ${i % 2}`)
    const basis = seriesBasis(values, 10.1)
    const r = readEpisode(pts, nextEpisode(values, 10.1, basis.sigma!)!, 10.1, basis.sigma!)
    expect(r.station).toBeNull()
    expect(r.outCount).toBe(4)
  })
})

describe('the practical minimum shift of a turn count', () => {
  // Half a turn: a reading nearer the nominal than that rounds to the nominal whole turn count
  // (DESIGN.md §7 flags a turn deviation only when it rounds to another whole turn). Common
  // practice, no source.
  it('is half a turn for a turn count, read or derived, and nothing for other checks', () => {
    expect(TURN_MIN_SHIFT).toBe(0.5)
    expect(practicalShift({ unit: 'turns', derived: null })).toBe(0.5)
    expect(practicalShift({ unit: 'turns', derived: 'secondary_turns_from_ratio' })).toBe(0.5)
    expect(practicalShift({ unit: null, derived: 'turn_deviation' })).toBe(0.5)
    expect(practicalShift({ unit: 'mH', derived: null })).toBe(0)
    expect(practicalShift({ unit: 'V', derived: null })).toBe(0)
  })

  // Constructed, like the demo's bench after a rework: 10 ratio-test readings alternating 92.01
  // and 92.03, then 10 alternating 91.92 and 91.94 (a reader's steady 0.07 turn low). MR̄ =
  // (18 × 0.02 + 0.09) / 19 = 0.0237 → σ = 0.021 (d2 1.128), so 91.93 is 3.3σ below 92: without
  // a minimum, rules 1, 2, 3 and 4 all break, for a shift no lead can rewind.
  const drift = [
    ...Array.from({ length: 10 }, (_, i) => (i % 2 ? 92.03 : 92.01)),
    ...Array.from({ length: 10 }, (_, i) => (i % 2 ? 91.94 : 91.92)),
  ]

  it('raises nothing for a steady shift of a few hundredths of a turn', () => {
    const plain = seriesBasis(drift, 92)
    expect(plain.minShift).toBe(0)
    const flagged = nextEpisode(drift, 92, plain.sigma!)
    expect(flagged?.rules).toEqual([1, 2, 3, 4])
    const turns = seriesBasis(drift, 92, TURN_MIN_SHIFT)
    expect(turns.minShift).toBe(0.5)
    expect(nextEpisode(drift, 92, turns.sigma!, 0, TURN_MIN_SHIFT)).toBeNull()
    expect(planEpisodes(drift, turns, { activeStart: null, armedFrom: 0 })).toEqual({ raise: [] })
  })

  it('still raises a miscount of two turns, and reads only the points that far off', () => {
    // Constructed: 10 calm readings near 92, six at 94 (two turns over), then the drift above.
    const values = [...drift.slice(0, 10), 94, 94.02, 93.99, 94.01, 94, 93.98, ...drift.slice(10)]
    const pts = points(values, (i) => (i >= 10 && i < 16 ? 'Bench 2' : 'Bench 1'))
    const basis = seriesBasis(values, 92, TURN_MIN_SHIFT)
    const plan = planEpisodes(values, basis, { activeStart: null, armedFrom: 0 })
    expect(plan.raise).toHaveLength(1)
    const e = plan.raise[0]!
    expect(e.start).toBe(10)
    // The low readings after the miscount break no rule by half a turn: the episode is over
    // once 8 of them follow its last hit, and nothing is raised after it.
    expect(e.isOver).toBe(true)
    const r = readEpisode(pts, e, 92, basis.sigma!, basis.minShift)
    expect(r).toMatchObject({ side: 'above', outCount: 6, station: 'Bench 2' })
    expect(r.shift).toBeCloseTo(2, 2) // mean of the six: 12.00 / 6 = 2.00, arithmetic
  })
})
