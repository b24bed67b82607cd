import { describe, expect, it } from 'vitest'
import { suggestedExpiry } from '../../../../shared/schemas/componentLots'
import {
  SupplierInput,
  supplierNameKey,
  tidySupplierName,
} from '../../../../shared/schemas/suppliers'

// Waymark's own rules for supplier names (common practice, no source).
describe('supplier names', () => {
  it('tidies spaces and keeps the case as typed', () => {
    expect(tidySupplierName('  Brindle \t Wire\u00a0 Co. ')).toBe('Brindle Wire Co.')
  })

  it('meets spellings that differ only in case or spacing under one key', () => {
    expect(supplierNameKey(' brindle  WIRE co.')).toBe(supplierNameKey('Brindle Wire Co.'))
    expect(supplierNameKey('Brindle Wire Co')).not.toBe(supplierNameKey('Brindle Wire Co.'))
  })

  it('refuses a blank or over-long name naming the field', () => {
    const blank = SupplierInput.safeParse({ name: '   ' })
    expect(blank.success).toBe(false)
    expect(blank.error?.issues[0]).toMatchObject({ path: ['name'], message: 'enter the supplier' })
    expect(SupplierInput.safeParse({ name: 'x'.repeat(121) }).success).toBe(false)
    expect(SupplierInput.parse({ name: ` ${'x'.repeat(120)} ` }).name).toHaveLength(120)
  })
})

describe('suggestedExpiry', () => {
  it('adds the shelf life in calendar days to the day received', () => {
    // Calendar arithmetic, from memory: 2026-11-20 + 180 d = 2027-05-19; 2028 is a leap year.
    expect(suggestedExpiry('2026-11-20', 180)).toBe('2027-05-19')
    expect(suggestedExpiry('2028-02-28', 1)).toBe('2028-02-29')
    expect(suggestedExpiry('2026-12-31', 365)).toBe('2027-12-31')
  })

  it('suggests nothing without a shelf life or a whole date', () => {
    expect(suggestedExpiry('2026-11-20', null)).toBeNull()
    expect(suggestedExpiry('2026-11', 30)).toBeNull()
    expect(suggestedExpiry('2026-13-45', 30)).toBeNull()
  })
})
