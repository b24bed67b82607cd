import { isValidSerial } from './serials'

const DIGITS = '0123456789'
const ALNUM = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ'
const SHAPE = /^([A-Z0-9]{2,6})-(\d{4})-(\d{5})([0-9A-Z])$/

/** The parts of a serial-shaped text: product code, year-week, sequence and check character. */
export interface SerialParts {
  productCode: string
  yearWeek: string
  sequence: number
  check: string
}

/** Splits a serial-shaped text into its parts, or null when it is not serial-shaped. */
export function serialParts(text: string): SerialParts | null {
  const m = SHAPE.exec(text.toUpperCase())
  if (!m) return null
  return { productCode: m[1]!, yearWeek: m[2]!, sequence: Number(m[3]), check: m[4]! }
}

/** Which characters may stand at each position of a serial of this shape (hyphens fixed). */
function alphabetAt(text: string, index: number): string | null {
  if (text[index] === '-') return null
  const firstHyphen = text.indexOf('-')
  // Product code and check character take letters and digits; year-week and sequence digits only.
  return index < firstHyphen || index === text.length - 1 ? ALNUM : DIGITS
}

/**
 * The serials one slip away from a mistyped one that carry a valid check character: every
 * single-character substitution and every swap of two neighbouring characters. These are the
 * two errors ISO/IEC 7064 MOD 37,36 is built to catch, so the real serial is among them when
 * the person made one such slip. Ordered as a person most likely slipped: a wrong check
 * character first, then sequence digits, then the year-week, then the product code.
 */
export function oneSlipCandidates(typed: string): string[] {
  const text = typed.toUpperCase()
  if (!SHAPE.test(text)) return []
  const rank = (index: number) => {
    if (index === text.length - 1) return 0
    const hyphens = [...text].map((c, i) => (c === '-' ? i : -1)).filter((i) => i >= 0)
    if (index > hyphens[1]!) return 1
    if (index > hyphens[0]!) return 2
    return 3
  }
  const found = new Map<string, number>()
  const keep = (candidate: string, r: number) => {
    if (candidate !== text && isValidSerial(candidate) && !found.has(candidate))
      found.set(candidate, r)
  }
  for (let i = 0; i < text.length; i++) {
    const alphabet = alphabetAt(text, i)
    if (!alphabet) continue
    for (const ch of alphabet) keep(text.slice(0, i) + ch + text.slice(i + 1), rank(i))
  }
  for (let i = 0; i + 1 < text.length; i++) {
    const a = text[i]!
    const b = text[i + 1]!
    if (a === b || a === '-' || b === '-') continue
    const swapped = text.slice(0, i) + b + a + text.slice(i + 2)
    if (SHAPE.test(swapped)) keep(swapped, Math.min(rank(i), rank(i + 1)))
  }
  return [...found.entries()].sort((x, y) => x[1] - y[1]).map(([s]) => s)
}
