// The demo seed's clock. The invented shop works Monday to Friday in two shifts, 06:00–14:00 and
// 14:00–22:00 (shop time is UTC, so the dates read the same on every machine). Its past is the
// last six weeks of working days before the anchor: the start of the day the seed runs, so the
// story always ends yesterday (or last Friday) whatever the date.

/** Working days in the demo's past: six weeks of five. */
export const DEMO_WORKING_DAYS = 30
/** The first shift starts at 06:00; the second ends at 22:00. */
export const SHIFT_DAY_START_HOUR = 6
export const SHIFT_DAY_END_HOUR = 22
/** Minutes of shop time in a working day (two eight-hour shifts). */
export const SHIFT_DAY_MINUTES = (SHIFT_DAY_END_HOUR - SHIFT_DAY_START_HOUR) * 60
/** Minutes after 06:00 at which the late shift takes over. */
export const LATE_SHIFT_FROM_MINUTE = 8 * 60

const DAY_MS = 86_400_000

/** The anchor of a seed run at `now`: midnight (UTC) at the start of that day. */
export function demoAnchor(now = new Date()): Date {
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()))
}

/** True for Monday to Friday (UTC). */
export function isWorkingDay(d: Date): boolean {
  const day = d.getUTCDay()
  return day >= 1 && day <= 5
}

export interface DemoClock {
  /** Midnight (UTC) of the day the seed ran: everything in the story happened before it. */
  anchor: Date
  /** Midnight of each working day of the past, oldest first (index 0 is six weeks back). */
  days: readonly Date[]
  /** Shop time on working day `day`, `minute` minutes after 06:00 (0 ≤ minute < 960). */
  at(day: number, minute: number): Date
  /** The date (YYYY-MM-DD) of working day `day`; past the last one, later working days. */
  date(day: number): string
}

/** The working days before `anchor`, and shop times on them. */
export function demoClock(anchor = demoAnchor()): DemoClock {
  const days: Date[] = []
  // Working days before the anchor, and a few after it for dates the story plans ahead (due dates).
  for (let t = anchor.getTime() - DAY_MS; days.length < DEMO_WORKING_DAYS; t -= DAY_MS)
    if (isWorkingDay(new Date(t))) days.unshift(new Date(t))
  const ahead: Date[] = []
  for (let t = anchor.getTime(); ahead.length < 60; t += DAY_MS)
    if (isWorkingDay(new Date(t))) ahead.push(new Date(t))
  const dayAt = (day: number): Date => {
    const d = day < days.length ? days[day] : ahead[day - days.length]
    if (!d || day < 0) throw new RangeError(`demo clock: no working day ${day}`)
    return d
  }
  return {
    anchor,
    days,
    at(day, minute) {
      if (minute < 0 || minute >= SHIFT_DAY_MINUTES)
        throw new RangeError(`demo clock: minute ${minute} is outside the shifts`)
      return new Date(dayAt(day).getTime() + (SHIFT_DAY_START_HOUR * 60 + minute) * 60_000)
    },
    date: (day) => dayAt(day).toISOString().slice(0, 10),
  }
}

/** The date `days` calendar days before the anchor, as YYYY-MM-DD (receipts, expiry dates). */
export function daysBefore(anchor: Date, days: number): string {
  return new Date(anchor.getTime() - days * DAY_MS).toISOString().slice(0, 10)
}
