import { describe, expect, it } from 'vitest'
import { derivedText, isScannedLink, limitsText } from '@/components/Floor/floorFormat'
import { numericCheck } from './fixtures'

describe('limitsText', () => {
  it('writes both limits with a dash and no padding zeros', () => {
    expect(limitsText(numericCheck())).toBe('81 – 135 µH')
    expect(limitsText(numericCheck({ lower: 9.9, upper: 10.1, unit: 'V', decimals: 2 }))).toBe(
      '9.9 – 10.1 V',
    )
  })

  it('writes an exact count, a floor and a ceiling', () => {
    expect(limitsText(numericCheck({ lower: 6, upper: 6, unit: 'turns', decimals: 0 }))).toBe(
      '= 6 turns',
    )
    expect(limitsText(numericCheck({ lower: 85, upper: null, unit: '%' }))).toBe('≥ 85 %')
    expect(limitsText(numericCheck({ lower: null, upper: 5, unit: 'mA' }))).toBe('≤ 5 mA')
    expect(limitsText(numericCheck({ lower: null, upper: null }))).toBe('')
  })
})

describe('derivedText', () => {
  it('shows the check’s decimals and unit, or that readings are missing', () => {
    expect(derivedText(3.84, { decimals: 1, unit: '%' })).toBe('3.8 %')
    expect(derivedText(null, { decimals: 1, unit: '%' })).toBe('waiting for readings')
  })
})

describe('isScannedLink', () => {
  it('tells our QR links from readings', () => {
    expect(isScannedLink('https://waymark.example/u/FP24-2649-00017K')).toBe(true)
    expect(isScannedLink('http://10.0.0.5:4870/c/CL-26-000048/')).toBe(true)
    expect(isScannedLink('108.5')).toBe(false)
  })
})
