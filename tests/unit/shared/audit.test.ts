import { describe, expect, it } from 'vitest'
import { actionWords, auditChanges, fieldWords, valueText } from '../../../shared/audit'

// How the audit log reads is our own wording (common practice, no source).
describe('audit wording', () => {
  it('names fields as words and drops an id suffix', () => {
    expect(fieldWords('reworkToStepId')).toBe('rework to step')
    expect(fieldWords('component_lot')).toBe('component lot')
    expect(fieldWords('unitIds')).toBe('units')
  })

  it('reads an action as its record and a past-tense verb', () => {
    expect(actionWords('revision.release')).toBe('revision released')
    expect(actionWords('component_lot.end_containment')).toBe('component lot containment ended')
    expect(actionWords('auth.sign_in_failed')).toBe('auth sign-in refused')
    // A verb nobody taught it is kept as words rather than dropped.
    expect(actionWords('lot.frobnicate_twice')).toBe('lot frobnicate twice')
  })

  it('writes values as one line', () => {
    expect(valueText(null)).toBe('—')
    expect(valueText(true)).toBe('yes')
    expect(valueText(['A', 'B'])).toBe('A, B')
    expect(valueText({ a: 1 })).toBe('{"a":1}')
    expect(valueText(0)).toBe('0')
  })
})

describe('auditChanges', () => {
  it('lists only the fields that differ, in the record order', () => {
    expect(
      auditChanges(
        { status: 'available', quantity: 10, note: null },
        { status: 'quarantined', quantity: 10, reason: 'AL low' },
      ),
    ).toEqual([
      { field: 'status', before: 'available', after: 'quarantined' },
      { field: 'reason', before: '—', after: 'AL low' },
    ])
  })

  it('lists every field of a creation with nothing before', () => {
    expect(auditChanges(null, { code: 'ST-2', isActive: true })).toEqual([
      { field: 'code', before: '—', after: 'ST-2' },
      { field: 'is active', before: '—', after: 'yes' },
    ])
  })

  it('never shows a hash, only that it changed', () => {
    expect(auditChanges({ passwordHash: 'x' }, { passwordHash: 'y' })).toEqual([
      { field: 'password hash', before: '(hidden)', after: '(changed)' },
    ])
  })

  it('treats a bare value as one change named value', () => {
    expect(auditChanges('a', 'b')).toEqual([{ field: 'value', before: 'a', after: 'b' }])
    expect(auditChanges(null, null)).toEqual([])
  })
})

describe('auditChanges bookkeeping', () => {
  it('leaves out the row’s own created and updated times', () => {
    expect(
      auditChanges(
        { name: 'a', updatedAt: '2026-01-01T00:00:00Z' },
        { name: 'b', updatedAt: '2026-01-02T00:00:00Z', createdAt: '2026-01-01T00:00:00Z' },
      ),
    ).toEqual([{ field: 'name', before: 'a', after: 'b' }])
  })
})
