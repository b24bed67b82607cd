import type { CheckDto } from '@shared/schemas/recipes'

type Limits = Pick<CheckDto, 'lower' | 'upper' | 'unit' | 'decimals' | 'nominal'>

/** A number with at most the check's decimals and no padding zeros: 81, 9.9, 0.857. */
export function plainNumber(value: number, decimals: number): string {
  return new Intl.NumberFormat('en-GB', {
    maximumFractionDigits: decimals,
    useGrouping: false,
  }).format(value)
}

/**
 * Limits as the bench reads them: "81 – 135 µH", "= 6 turns", "≥ 85 %", "≤ 5 mA"; empty
 * when the check has no limits.
 */
export function limitsText(check: Limits): string {
  const unit = check.unit ? ` ${check.unit}` : ''
  const { lower, upper, decimals } = check
  if (lower !== null && upper !== null) {
    if (lower === upper) return `= ${plainNumber(lower, decimals)}${unit}`
    return `${plainNumber(lower, decimals)} – ${plainNumber(upper, decimals)}${unit}`
  }
  if (lower !== null) return `≥ ${plainNumber(lower, decimals)}${unit}`
  if (upper !== null) return `≤ ${plainNumber(upper, decimals)}${unit}`
  return ''
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
