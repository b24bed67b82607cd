import { describe, expect, it } from 'vitest'
import { isValidMod3736, mod3736CheckCharacter } from '../../../shared/checkCharacter'

describe('ISO/IEC 7064 MOD 37,36', () => {
  it('matches the published vectors', () => {
    // python-stdnum, iso7064.mod_37_36 documentation example: A12425GABC1234002 → M.
    expect(mod3736CheckCharacter('A12425GABC1234002')).toBe('M')
    // Test vectors of the cdigit npm package (mod37_36): TBR → 1.
    expect(mod3736CheckCharacter('TBR')).toBe('1')
  })

  it('validates a code with its check character and rejects a changed one', () => {
    expect(isValidMod3736('A12425GABC1234002M')).toBe(true)
    expect(isValidMod3736('A12425GABC1234002N')).toBe(false)
    expect(isValidMod3736('TBR1')).toBe(true)
  })

  it('ignores hyphens and case', () => {
    const body = 'FP24-2649-00017'
    const check = mod3736CheckCharacter(body)
    expect(mod3736CheckCharacter('fp24264900017')).toBe(check)
    expect(isValidMod3736(`${body}${check}`.toLowerCase())).toBe(true)
  })

  it('throws a RangeError on a character outside 0-9 A-Z', () => {
    expect(() => mod3736CheckCharacter('FP24_001')).toThrow(RangeError)
    expect(() => isValidMod3736('AB*C')).toThrow(RangeError)
  })

  it('catches every single substitution and every neighbour swap in a serial body', () => {
    // The property the standard claims for hybrid systems (ISO/IEC 7064 §5); checked exhaustively here.
    const alphabet = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ'
    const code = 'FP24264900017'
    const full = code + mod3736CheckCharacter(code)
    for (let i = 0; i < full.length; i++) {
      for (const ch of alphabet)
        if (ch !== full[i])
          expect(isValidMod3736(full.slice(0, i) + ch + full.slice(i + 1))).toBe(false)
      if (i + 1 < full.length && full[i] !== full[i + 1])
        expect(isValidMod3736(full.slice(0, i) + full[i + 1] + full[i] + full.slice(i + 2))).toBe(
          false,
        )
    }
  })
})
