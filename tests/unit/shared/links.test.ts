import { describe, expect, it } from 'vitest'
import { codeFromScan, componentLotUrl, unitUrl } from '../../../shared/links'

describe('scan links', () => {
  it('builds the traveler and lot-label URLs', () => {
    expect(unitUrl('https://waymark.example/', 'FP24-2649-00017K')).toBe(
      'https://waymark.example/u/FP24-2649-00017K',
    )
    expect(componentLotUrl('http://127.0.0.1:4870', 'CL-26-00001E')).toBe(
      'http://127.0.0.1:4870/c/CL-26-00001E',
    )
  })

  it('reads the code from a bare scan or from one of our URLs', () => {
    expect(codeFromScan(' fp24-2649-00017k\n')).toBe('FP24-2649-00017K')
    expect(codeFromScan('https://waymark.example/u/FP24-2649-00017K')).toBe('FP24-2649-00017K')
    expect(codeFromScan('http://host:4870/c/CL-26-00001E/')).toBe('CL-26-00001E')
    expect(codeFromScan('http://host/u/FP24-2649-00017K?src=label')).toBe('FP24-2649-00017K')
  })
})
