import { describe, expect, it } from 'vitest'
import { derivedText, isScannedLink } from '@/components/Floor/floorFormat'

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
