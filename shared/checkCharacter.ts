/** The 36 characters of ISO/IEC 7064 MOD 37,36, in value order. */
const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ'
const M = ALPHABET.length

function values(text: string): number[] {
  return [...text.replace(/-/g, '').toUpperCase()].map((ch) => {
    const v = ALPHABET.indexOf(ch)
    if (v < 0) throw new RangeError(`character "${ch}" is not 0-9 or A-Z`)
    return v
  })
}

/** The running remainder of the hybrid system: start at M/2, then ((p || M)·2 mod (M+1) + c) mod M. */
function remainder(digits: number[]): number {
  let p = M / 2
  for (const c of digits) p = ((((p || M) * 2) % (M + 1)) + c) % M
  return p
}

/**
 * The ISO/IEC 7064 MOD 37,36 check character for `body` (hyphens and case ignored). It catches
 * every single substitution and every transposition of neighbours when a person types a code.
 * Throws a RangeError on a character outside 0-9 A-Z.
 */
export function mod3736CheckCharacter(body: string): string {
  const p = remainder(values(body))
  return ALPHABET[(M + 1 - (((p || M) * 2) % (M + 1))) % M]!
}

/** Whether the last character of `code` is the right check character for the rest. */
export function isValidMod3736(code: string): boolean {
  const digits = values(code)
  return digits.length >= 2 && remainder(digits) === 1
}
