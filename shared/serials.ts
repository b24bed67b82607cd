import { isValidMod3736, mod3736CheckCharacter } from './checkCharacter'

/** Largest sequence a serial's five digits hold in one product-week. */
export const SERIAL_SEQUENCE_MAX = 99999

/**
 * The ISO 8601 week of a date as `YYWW` (two-digit ISO week-numbering year, two-digit week).
 * 2026-12-01 is in week 49 of 2026, so `2649`. Uses the UTC calendar day.
 */
export function isoYearWeek(date: Date): string {
  const day = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()))
  const weekday = day.getUTCDay() || 7
  day.setUTCDate(day.getUTCDate() + 4 - weekday) // the Thursday of this week decides the year
  const year = day.getUTCFullYear()
  const week = Math.ceil(((day.getTime() - Date.UTC(year, 0, 1)) / 86400000 + 1) / 7)
  return `${String(year % 100).padStart(2, '0')}${String(week).padStart(2, '0')}`
}

/** A serial `<code>-<YYWW>-<5 digits><check>` (DESIGN.md §6). */
export function formatSerial(productCode: string, yearWeek: string, sequence: number): string {
  if (!Number.isInteger(sequence) || sequence < 1 || sequence > SERIAL_SEQUENCE_MAX)
    throw new RangeError(`sequence ${sequence} is outside 1–${SERIAL_SEQUENCE_MAX}`)
  const body = `${productCode}-${yearWeek}-${String(sequence).padStart(5, '0')}`
  return body + mod3736CheckCharacter(body)
}

const SERIAL_SHAPE = /^([A-Z0-9]{2,6})-(\d{4})-(\d{5})([0-9A-Z])$/

/** Whether text has the shape of a serial, whatever its check character. */
export function looksLikeSerial(text: string): boolean {
  return SERIAL_SHAPE.test(text.toUpperCase())
}

/** Whether a serial has the right shape and the right check character. */
export function isValidSerial(text: string): boolean {
  return looksLikeSerial(text) && isValidMod3736(text)
}
