import { describe, expect, it } from 'vitest'
import {
  isoTime,
  isoTimeOrNull,
  partFields,
  pickCamel,
  pickFields,
} from '../../../../server/services/presenters'

describe('pickFields', () => {
  it('copies only the named fields, values untouched', () => {
    const source = { id: 'a', code: 'W1', notes: null, hidden: 'secret' }
    expect(pickFields(source, ['id', 'code', 'notes'])).toEqual({
      id: 'a',
      code: 'W1',
      notes: null,
    })
  })

  it('reads fields a class serves through getters, as Sequelize models do', () => {
    class Row {
      get code(): string {
        return 'W2'
      }
    }
    expect(pickFields(new Row(), ['code'])).toEqual({ code: 'W2' })
  })
})

describe('pickCamel', () => {
  it('renames snake_case columns to camelCase and leaves the rest out', () => {
    const row = { id: 'a', lot_number: 'L-1', rework_to_step_id: null, created_at: 'x' }
    expect(pickCamel(row, ['id', 'lot_number', 'rework_to_step_id'])).toEqual({
      id: 'a',
      lotNumber: 'L-1',
      reworkToStepId: null,
    })
  })

  it('keeps digits inside a word (mm2)', () => {
    expect(pickCamel({ core_area_mm2: 5 }, ['core_area_mm2'])).toEqual({ coreAreaMm2: 5 })
  })
})

describe('isoTime', () => {
  it('reads a Date and the text JSON gives back alike', () => {
    const at = new Date('2026-12-05T10:00:00.000Z')
    expect(isoTime(at)).toBe('2026-12-05T10:00:00.000Z')
    expect(isoTime('2026-12-05T10:00:00+00:00')).toBe('2026-12-05T10:00:00.000Z')
  })

  it('keeps a missing time missing', () => {
    expect(isoTimeOrNull(null)).toBeNull()
    expect(isoTimeOrNull(undefined)).toBeNull()
    expect(isoTimeOrNull(new Date(0))).toBe('1970-01-01T00:00:00.000Z')
  })
})

describe('partFields', () => {
  it('names the loaded part, or stays blank in pieces without one', () => {
    const part = { partNumber: 'C-100', description: 'Film cap', unitOfMeasure: 'm' as const }
    expect(partFields(part)).toEqual({
      partNumber: 'C-100',
      partDescription: 'Film cap',
      unitOfMeasure: 'm',
    })
    expect(partFields(undefined)).toEqual({
      partNumber: '',
      partDescription: '',
      unitOfMeasure: 'pcs',
    })
  })
})
