import { describe, expect, it } from 'vitest'
import { changedFields } from '../../../../server/services/audit/audit'

describe('changedFields', () => {
  it('keeps only the fields whose values differ, on both sides', () => {
    const before = { name: 'Old', code: 'A', isActive: true, tags: ['x'] }
    const after = { name: 'New', code: 'A', isActive: false, tags: ['x'] }
    expect(changedFields(before, after)).toEqual({
      before: { name: 'Old', isActive: true },
      after: { name: 'New', isActive: false },
    })
  })

  it('gives empty sides when nothing changed', () => {
    expect(changedFields({ a: 1 }, { a: 1 })).toEqual({ before: {}, after: {} })
  })
})
