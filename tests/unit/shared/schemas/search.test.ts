import { describe, expect, it } from 'vitest'
import { SearchQuery, searchKindsFor } from '../../../../shared/schemas/search'

describe('SearchQuery', () => {
  it('takes 2 to 80 characters after trimming and names q when it refuses', () => {
    expect(SearchQuery.parse({ q: '  L-4 ' })).toEqual({ q: 'L-4' })
    for (const q of [undefined, '', ' a ', 'x'.repeat(81), 'ab\u0000', ['ab', 'cd']]) {
      const result = SearchQuery.safeParse({ q })
      expect(result.success, String(q)).toBe(false)
      expect(result.error?.issues[0]?.path).toEqual(['q'])
    }
  })
})

describe('searchKindsFor', () => {
  it('gives each role the kinds of record it may read elsewhere', () => {
    expect(searchKindsFor('operator')).toEqual(['revision'])
    expect(searchKindsFor('stores')).toEqual(['componentLot', 'revision'])
    expect(searchKindsFor('service')).toEqual([
      'unit',
      'lot',
      'componentLot',
      'customer',
      'revision',
      'shipment',
      'serviceCase',
    ])
  })
})
