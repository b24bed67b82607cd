/** The URL a traveler's QR holds: a phone opens the unit's trace (DESIGN.md §6). */
export function unitUrl(baseUrl: string, serial: string): string {
  return `${baseUrl.replace(/\/$/, '')}/u/${encodeURIComponent(serial)}`
}

/** The URL a component lot label's QR holds. */
export function componentLotUrl(baseUrl: string, code: string): string {
  return `${baseUrl.replace(/\/$/, '')}/c/${encodeURIComponent(code)}`
}

/**
 * The code inside what a scanner typed: a bare code, or one of our URLs (`…/u/<serial>`,
 * `…/c/<code>`). Trims, drops a trailing slash and upper-cases, since codes are upper-case.
 */
export function codeFromScan(scanned: string): string {
  const text = scanned.trim().replace(/\/+$/, '')
  const match = /\/(?:u|c)\/([^/?#]+)(?:[?#].*)?$/.exec(text)
  return decodeURIComponent(match ? match[1]! : text).toUpperCase()
}
