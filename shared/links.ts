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
 *
 * This is the one place scan text is decoded, and only the URL's segment is: a bare code is
 * taken as typed (`50%OFF` stays `50%OFF`, and is then not a code), and a segment that is not
 * valid percent-encoding is kept as it was. It never throws.
 */
export function codeFromScan(scanned: string): string {
  const text = scanned.trim().replace(/\/+$/, '')
  const match = /\/(?:u|c)\/([^/?#]+)(?:[?#].*)?$/i.exec(text)
  return (match ? decodedSegment(match[1]!) : text).toUpperCase()
}

function decodedSegment(segment: string): string {
  try {
    return decodeURIComponent(segment)
  } catch {
    return segment
  }
}

/** The shape every code we issue has (serials, component lot codes, station codes). */
const CODE_SHAPE = /^[A-Z0-9][A-Z0-9-]*$/

/** Whether text (as `codeFromScan` returns it) could be one of our codes: letters, digits, hyphens. */
export function isCode(text: string): boolean {
  return CODE_SHAPE.test(text)
}

/** Whether scanned text names a code once read: `not a serial` when it does not. */
export function isScannedCode(scanned: string): boolean {
  return isCode(codeFromScan(scanned))
}

/** What a person's badge QR holds: `BADGE-` and 16 characters of Crockford's base 32 (80 bits). */
export const BADGE_CODE_SHAPE = /^BADGE-[0-9A-HJKMNP-TV-Z]{16}$/

/** Whether scanned text (trimmed, any case) is a person's badge rather than a unit or a lot. */
export function isBadgeCode(scanned: string): boolean {
  return BADGE_CODE_SHAPE.test(scanned.trim().toUpperCase())
}

/** The shape of our component lot codes: `CL-`, the receipt's year, a number and a check character. */
const COMPONENT_LOT_CODE_SHAPE = /^CL-\d{2}-\d{5,}[0-9A-Z*]$/

/** Whether a code (as `codeFromScan` returns it) has the shape of one of our component lot codes. */
export function looksLikeComponentLotCode(code: string): boolean {
  return COMPONENT_LOT_CODE_SHAPE.test(code)
}
