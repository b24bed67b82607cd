import { describe, expect, it } from 'vitest'
import { mod3736CheckCharacter } from '../../../shared/checkCharacter'
import { containsPattern, searchTerms } from '../../../shared/searchTerms'

// The check character of this body comes from mod3736CheckCharacter, itself checked against
// published ISO/IEC 7064 vectors in checkCharacter.test.ts.
const BODY = 'FP24-2649-00017'
const SERIAL = BODY + mod3736CheckCharacter(BODY)
const WRONG = BODY + (SERIAL.endsWith('A') ? 'B' : 'A')

describe('searchTerms', () => {
  it('takes a serial with the right check character as it is', () => {
    const terms = searchTerms(`  ${SERIAL.toLowerCase()} `)
    expect(terms.serials).toEqual([SERIAL])
    expect(terms.serialFix).toBe('none')
    expect(terms.text).toBe(SERIAL.toLowerCase())
  })

  it('adds the check character to a serial typed without one', () => {
    expect(searchTerms(BODY)).toMatchObject({ serials: [SERIAL], serialFix: 'added' })
  })

  it('corrects a wrong check character first, then offers serials one slip away', () => {
    const terms = searchTerms(WRONG)
    expect(terms.serialFix).toBe('corrected')
    expect(terms.serials[0]).toBe(SERIAL)
    expect(terms.serials.length).toBeGreaterThan(1)
    expect(new Set(terms.serials).size).toBe(terms.serials.length)
    expect(terms.serials).not.toContain(WRONG)
  })

  it("reads a traveler's scanned link as its serial", () => {
    expect(searchTerms(`https://waymark.example/u/${SERIAL}`).serials).toEqual([SERIAL])
  })

  it('finds no serial in text that is not shaped like one', () => {
    for (const text of ['L-0042', 'Harrow', 'FP24', 'FP24-2649', 'CL-26-00025'])
      expect(searchTerms(text).serials, text).toEqual([])
  })

  it('reads a product code and a revision letter written several ways', () => {
    for (const text of ['FP24 B', 'fp24-b', 'FP24 rev B', 'FP24 REV. B', 'FP24/B'])
      expect(searchTerms(text).revision, text).toEqual({ productCode: 'FP24', letter: 'B' })
    expect(searchTerms('FP24').revision).toBeNull()
    expect(searchTerms('Harrow Freight Ltd').revision).toBeNull()
  })
})

describe('containsPattern', () => {
  it('wraps the text in wildcards and takes its own wildcards literally', () => {
    expect(containsPattern('L-00')).toBe('%L-00%')
    expect(containsPattern('50%_off\\')).toBe('%50\\%\\_off\\\\%')
  })
})
