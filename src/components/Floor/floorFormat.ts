import type { CheckDto } from '@shared/schemas/recipes'

/** What a check's control is told about its field: its id, its label and its verdict so far. */
export interface FloorField {
  fieldId: string
  label: string
  isFail: boolean
  isPass: boolean
}

/** A computed value with the check's decimals and unit, or a prompt when inputs are missing. */
export function derivedText(value: unknown, check: Pick<CheckDto, 'decimals' | 'unit'>): string {
  if (typeof value !== 'number' || !Number.isFinite(value)) return 'waiting for readings'
  return `${value.toFixed(check.decimals)}${check.unit ? ` ${check.unit}` : ''}`
}

/** Whether typed text is one of our QR links rather than a reading: `…/u/<serial>` or `…/c/<code>`. */
export function isScannedLink(text: string): boolean {
  return /\/(u|c)\/[^/\s]+\/?$/i.test(text.trim())
}

const LAST_STATION_KEY = 'waymark.floor.station'

/** The station this device opened last; a bench tablet stays at one bench. */
export function lastStationCode(): string | null {
  try {
    return localStorage.getItem(LAST_STATION_KEY)
  } catch {
    return null
  }
}

/** Remembers the station this device works at. */
export function rememberStation(code: string): void {
  try {
    localStorage.setItem(LAST_STATION_KEY, code)
  } catch {
    // Private mode or storage full: the picker just offers no shortcut.
  }
}

const clockFormat = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit' })
const dayFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short' })

/**
 * A time as a bench reads it: the clock alone for today, the day in front otherwise
 * ("3 Dec 14:05"), so yesterday's run is never mistaken for this morning's.
 */
export function benchTime(iso: string, now: Date = new Date()): string {
  const date = new Date(iso)
  if (Number.isNaN(date.getTime())) return ''
  const isToday = date.toDateString() === now.toDateString()
  return isToday
    ? clockFormat.format(date)
    : `${dayFormat.format(date)} ${clockFormat.format(date)}`
}
