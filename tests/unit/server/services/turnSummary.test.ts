import { describe, expect, it } from 'vitest'
import type { TurnRunDto } from '../../../../shared/schemas/yield'
import { turnSummary } from '../../../../server/services/quality/turnSummary'

const run = (i: number, over: Partial<TurnRunDto> = {}): TurnRunDto => ({
  stepRunId: `r${i}`,
  serial: `S${i}`,
  attempt: 1,
  finishedAt: '2026-11-24T08:00:00Z',
  stationCode: 'WND-1',
  operatorName: 'A',
  inductance: 26,
  turnsFromRatio: 92,
  ratioDeviation: 0,
  turnsFromInductance: 93,
  inductanceDeviation: 1,
  offMedianPercent: 0,
  medianDeviation: 0,
  isSuspect: false,
  suspectBy: [],
  ...over,
})
const miscounted = (i: number) =>
  run(i, {
    stationCode: 'WND-2',
    turnsFromRatio: 94.02,
    isSuspect: true,
    suspectBy: ['ratio', 'median'],
  })
const base = {
  name: 'secondary',
  nominalTurns: 92,
  alTolerancePercent: 25,
  lotOffsetPercent: 6.02,
  byStation: [
    { label: 'WND-1', runs: 8, suspects: 0, meanRatioDeviation: 0, meanMedianDeviation: 0 },
    { label: 'WND-2', runs: 4, suspects: 2, meanRatioDeviation: 1, meanMedianDeviation: 1 },
  ],
}

describe('turnSummary', () => {
  it('names the bench of the suspects and the ratio reading, and the core lot', () => {
    const runs = [run(1), miscounted(2), miscounted(3), run(4)]
    const text = turnSummary({ ...base, runs, suspects: 2, verdict: 'core_lot_and_miscount' })
    expect(text).toBe(
      '2 winding runs of 4 look miscounted: the ratio test reads 94 turns where 92 are specified. ' +
        'Wound at WND-2 (2 of the 2 suspects, out of 4 wound there). ' +
        'The lot as a whole reads +6.0 % from the nominal inductance while its units agree with ' +
        'each other: that looks like the core lot (AL tolerance ±25 %), not the winding.',
    )
  })

  it('says when all is in line, and when nothing was measured', () => {
    expect(turnSummary({ ...base, runs: [run(1)], suspects: 0, verdict: 'in_line' })).toContain(
      'no suspected miscount',
    )
    expect(turnSummary({ ...base, runs: [], suspects: 0, verdict: 'no_data' })).toBe(
      'No secondary winding has been measured yet.',
    )
  })
})
