import { describe, expect, it } from 'vitest'
import { codeFromScan, componentLotUrl, isScannedCode, unitUrl } from '../../../shared/links'

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

  it('decodes only the URL segment, once, and never throws on a stray %', () => {
    // A bare code is taken as typed: a % in it is not an escape.
    expect(codeFromScan('zz%')).toBe('ZZ%')
    expect(codeFromScan('50%OFF')).toBe('50%OFF')
    expect(codeFromScan('FP24%2D2649')).toBe('FP24%2D2649')
    // The segment of one of our URLs is percent-decoded, once.
    expect(codeFromScan('http://host/u/FP24%2D2649-00017K')).toBe('FP24-2649-00017K')
    expect(codeFromScan('http://host/u/A%2525')).toBe('A%25')
    // A segment that is not valid percent-encoding is kept as it was.
    expect(codeFromScan('http://host/u/%E0%A4%A')).toBe('%E0%A4%A')
    expect(codeFromScan('http://host/u/%ED%A0%80')).toBe('%ED%A0%80')
    // A scanner in caps lock still yields the code.
    expect(codeFromScan('HTTP://HOST/U/FP24-2649-00017K')).toBe('FP24-2649-00017K')
  })

  it('tells scan text that names a code from text that cannot', () => {
    expect(isScannedCode('fp24-2649-00017k')).toBe(true)
    expect(isScannedCode('http://host:4870/c/CL-26-00001E/')).toBe(true)
    for (const bad of [
      'ZZ%',
      '50%OFF',
      'http://host/u/ZZ%',
      'http://host/u/%E0%A4%A',
      '',
      '-A',
      'A B',
      'A\u0000',
    ])
      expect(isScannedCode(bad), bad).toBe(false)
  })
})
