import { describe, expect, it } from 'vitest'
import {
  demoAnchor,
  demoClock,
  DEMO_WORKING_DAYS,
  isWorkingDay,
} from '../../../../server/seed/demoClock'

describe('the demo clock', () => {
  it('anchors at midnight UTC of the day the seed runs', () => {
    expect(demoAnchor(new Date('2026-12-05T15:42:07Z')).toISOString()).toBe(
      '2026-12-05T00:00:00.000Z',
    )
  })

  it('counts six weeks of working days back from the anchor, oldest first', () => {
    // Saturday 5 December 2026: the last working day is Friday 4 December, and 30 working days
    // back start on Monday 26 October (calendar of 2026, from memory and checked by weekday).
    const clock = demoClock(demoAnchor(new Date('2026-12-05T09:00:00Z')))
    expect(clock.days).toHaveLength(DEMO_WORKING_DAYS)
    expect(clock.days.every(isWorkingDay)).toBe(true)
    expect(clock.date(0)).toBe('2026-10-26')
    expect(clock.date(29)).toBe('2026-12-04')
    // On a Monday the story ends the Friday before.
    expect(demoClock(demoAnchor(new Date('2026-12-07T09:00:00Z'))).date(29)).toBe('2026-12-04')
  })

  it('places shop times in the two shifts and refuses others', () => {
    const clock = demoClock(demoAnchor(new Date('2026-12-05T09:00:00Z')))
    expect(clock.at(29, 0).toISOString()).toBe('2026-12-04T06:00:00.000Z')
    expect(clock.at(29, 959).toISOString()).toBe('2026-12-04T21:59:00.000Z')
    expect(() => clock.at(29, 960)).toThrow(RangeError)
    expect(() => clock.at(-1, 0)).toThrow(RangeError)
    // Days past the last one are the working days after the anchor (due dates).
    expect(clock.date(30)).toBe('2026-12-07')
  })
})
