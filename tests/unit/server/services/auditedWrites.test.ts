import { UniqueConstraintError } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { AppError } from '../../../../server/errors'
import { conflictOnDuplicate, statusMove } from '../../../../server/services/audit'

describe('conflictOnDuplicate', () => {
  const onDuplicate = conflictOnDuplicate('another part has this part number', {
    partNumber: 'already in use',
  })

  it('turns a unique-index refusal into a 409 naming the field', () => {
    let thrown: unknown
    try {
      onDuplicate(new UniqueConstraintError({ message: 'parts_part_number_key' }))
    } catch (err) {
      thrown = err
    }
    expect(thrown).toBeInstanceOf(AppError)
    expect(thrown).toMatchObject({
      status: 409,
      code: 'duplicate',
      message: 'another part has this part number',
      fields: { partNumber: 'already in use' },
    })
  })

  it('passes any other error on unchanged', () => {
    const other = new Error('connection lost')
    expect(() => onDuplicate(other)).toThrow(other)
  })
})

describe('statusMove', () => {
  it('records the status before and after', () => {
    expect(statusMove('draft', 'released')).toEqual({
      before: { status: 'draft' },
      after: { status: 'released' },
    })
  })
})
