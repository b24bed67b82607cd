import { mod3736CheckCharacter } from './checkCharacter'
import { codeFromScan } from './links'
import { oneSlipCandidates } from './serialSuggestions'
import { isValidSerial, looksLikeSerial } from './serials'

/** A serial without its check character: `<code>-<YYWW>-<5 digits>`. */
const SERIAL_BODY = /^[A-Z0-9]{2,6}-\d{4}-\d{5}$/

/** `FP24 B`, `FP24-B`, `FP24 rev B`, `FP24/B`: a product code and a revision letter. */
const PRODUCT_REVISION = /^([A-Z0-9]{2,6})\s*(?:[-/\s]\s*|\s+REV\.?\s*)([A-Z]{1,3})$/

/** What one search box text asks for, read once for every kind of record. */
export interface SearchTerms {
  /** The text as typed, trimmed, for contains-matching (any case). */
  text: string
  /** The text read as a code: a scanned URL's code, upper-cased (`codeFromScan`). */
  code: string
  /**
   * Serials the text can only mean, best first: the serial itself when its check character is
   * right; with the right check character when it was left off or is wrong; then serials one
   * slip away (a substituted character or two swapped neighbours) that carry a valid one.
   */
  serials: string[]
  /** How `serials[0]` came from the text: as typed, or with its check character added or corrected. */
  serialFix: 'none' | 'added' | 'corrected'
  /** A product code and revision letter, when the text has that shape. */
  revision: { productCode: string; letter: string } | null
}

/**
 * Reads search text: a traveler's scanned URL (`…/u/<serial>`) counts as its serial, and a serial
 * typed without or with a wrong check character (ISO/IEC 7064 MOD 37,36, DESIGN.md §6) still
 * names the unit.
 */
export function searchTerms(typed: string): SearchTerms {
  const text = typed.trim()
  const code = codeFromScan(text)
  const serials: string[] = []
  let serialFix: SearchTerms['serialFix'] = 'none'
  if (SERIAL_BODY.test(code)) {
    serials.push(code + mod3736CheckCharacter(code))
    serialFix = 'added'
  } else if (looksLikeSerial(code)) {
    if (isValidSerial(code)) serials.push(code)
    else {
      serialFix = 'corrected'
      const body = code.slice(0, -1)
      serials.push(body + mod3736CheckCharacter(body))
      for (const other of oneSlipCandidates(code)) if (!serials.includes(other)) serials.push(other)
    }
  }
  const revision = PRODUCT_REVISION.exec(text.toUpperCase())
  return {
    text,
    code,
    serials,
    serialFix,
    revision: revision ? { productCode: revision[1]!, letter: revision[2]! } : null,
  }
}

/**
 * A LIKE pattern that finds `text` anywhere, its own `%`, `_` and `\` taken literally
 * (PostgreSQL's default escape character is the backslash).
 */
export function containsPattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`
}
