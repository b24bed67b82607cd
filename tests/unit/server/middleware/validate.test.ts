import { describe, expect, it } from 'vitest'
import { StationCreateInput } from '../../../../shared/schemas/stations'
import { AppError } from '../../../../server/errors'
import { parse } from '../../../../server/middleware/validate'

describe('parse', () => {
  it('returns the typed, normalised value', () => {
    expect(parse(StationCreateInput, { code: ' wnd-3 ', name: 'Bench', kind: 'winding' })).toEqual({
      code: 'WND-3',
      name: 'Bench',
      kind: 'winding',
    })
  })

  it('throws a 400 AppError naming every bad field, the first in the message', () => {
    try {
      parse(StationCreateInput, { code: '', kind: 'x' })
      expect.unreachable()
    } catch (err) {
      expect(err).toBeInstanceOf(AppError)
      const e = err as AppError
      expect(e.status).toBe(400)
      expect(Object.keys(e.fields ?? {}).sort()).toEqual(['code', 'kind', 'name'])
      expect(e.message).toMatch(/^code: /)
    }
  })
})
