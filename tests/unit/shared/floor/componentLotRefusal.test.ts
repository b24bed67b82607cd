import { describe, expect, it } from 'vitest'
import { componentLotRefusal } from '../../../../shared/floor/componentLotRefusal'
import type { LotToFit } from '../../../../shared/floor/componentLotRefusal'

// The Floor's own rules and words (common practice, no source).
const line = { partId: 'part-core', partNumber: 'FCS-3000U' }
const lot = (over: Partial<LotToFit> = {}): LotToFit => ({
  id: 'cl-48',
  internalCode: 'CL-26-000048',
  partId: 'part-core',
  partNumber: 'FCS-3000U',
  status: 'available',
  expiresOn: '2026-12-02',
  quantityRemaining: 2,
  ...over,
})

describe('componentLotRefusal', () => {
  it('fits an available lot of the line’s part, on its expiry day, with enough left', () => {
    expect(componentLotRefusal(lot(), line, 2, '2026-12-02')).toBeNull()
  })

  it('says why a lot may not be fitted', () => {
    const why = (over: Partial<LotToFit>, perUnit = 1) =>
      componentLotRefusal(lot(over), line, perUnit, '2026-12-02')
    expect(why({ partId: 'part-pcb', partNumber: 'PCB-FP24-B' })).toBe(
      'CL-26-000048 is PCB-FP24-B; this line needs FCS-3000U',
    )
    expect(why({ status: 'quarantined', awaitsInspection: true })).toBe(
      'CL-26-000048 is awaiting incoming inspection; take a lot that stores have accepted',
    )
    expect(why({ status: 'quarantined', awaitsInspection: false })).toBe(
      'CL-26-000048 is quarantined; take a lot that is available',
    )
    expect(why({ status: 'rejected' })).toBe('CL-26-000048 was rejected; return it to stores')
    expect(why({ status: 'used_up' })).toBe('CL-26-000048 is used up; take a new lot from stores')
    expect(why({ expiresOn: '2026-12-01' })).toBe(
      'CL-26-000048 expired on 2026-12-01; return it to stores',
    )
    expect(why({}, 3)).toBe('CL-26-000048 has only 2 left; this unit needs 3')
  })
})
