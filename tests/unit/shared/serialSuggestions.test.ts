import { describe, expect, it } from 'vitest'
import { oneSlipCandidates, serialParts } from '../../../shared/serialSuggestions'
import { formatSerial, isValidSerial } from '../../../shared/serials'

const real = formatSerial('FP24', '2649', 17)

describe('oneSlipCandidates', () => {
  it('offers the real serial first when only the check character was mistyped', () => {
    const wrong = real.slice(0, -1) + (real.endsWith('A') ? 'B' : 'A')
    expect(oneSlipCandidates(wrong)[0]).toBe(real)
  })

  it('finds the real serial behind two swapped sequence digits', () => {
    // 00017 typed as 00071: ISO/IEC 7064 MOD 37,36 detects every swap of neighbours (the
    // standard's stated property), so the typed text is invalid and swapping back is a candidate.
    const swapped = real.replace('00017', '00071')
    expect(isValidSerial(swapped)).toBe(false)
    expect(oneSlipCandidates(swapped)).toContain(real)
  })

  it('finds the real serial behind one wrong digit of the week', () => {
    const typo = real.replace('-2649-', '-2643-')
    expect(oneSlipCandidates(typo)).toContain(real)
  })

  it('returns only well-formed serials with a valid check character, each once', () => {
    const list = oneSlipCandidates(real.replace('00017', '00018'))
    expect(list.length).toBeGreaterThan(0)
    expect(list.every(isValidSerial)).toBe(true)
    expect(new Set(list).size).toBe(list.length)
  })

  it('offers nothing for text that is not shaped like a serial', () => {
    expect(oneSlipCandidates('HELLO')).toEqual([])
    expect(serialParts('HELLO')).toBeNull()
    expect(serialParts(real)).toMatchObject({ productCode: 'FP24', yearWeek: '2649', sequence: 17 })
  })
})
