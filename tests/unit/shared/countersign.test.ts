import { describe, expect, it } from 'vitest'
import { countersignRefusal } from '../../../shared/countersign'
import type { Countersigner } from '../../../shared/countersign'

// The rules of a second signature and their words: common practice, no source.
const engineer = {
  id: 'u-eng',
  email: 'engineer@ferncastle.example',
  role: 'engineer' as const,
  isActive: true,
}
const read = (over: Partial<Countersigner> = {}, isPasswordRight = true) => ({
  email: engineer.email,
  user: { ...engineer, ...over },
  isPasswordRight,
})

describe('countersignRefusal', () => {
  it('counts an active other user of an allowed role with the right password', () => {
    expect(countersignRefusal(read(), 'u-lead', ['engineer'], 'use as is')).toBeNull()
  })

  it('names the field and the reason otherwise; only wrong credentials are audited', () => {
    const why = (r: Parameters<typeof countersignRefusal>[0], actor = 'u-lead') =>
      countersignRefusal(r, actor, ['engineer'], 'use as is')
    expect(why(null)).toEqual({
      code: 'validation_failed',
      message: 'countersign: use as is needs a second person to sign',
      field: 'a second person must sign',
      isWrongCredentials: false,
    })
    expect(why(read({}, false))).toMatchObject({
      code: 'countersign_rejected',
      isWrongCredentials: true,
    })
    expect(why({ email: 'nobody@x.example', user: null, isPasswordRight: false })?.field).toBe(
      'e-mail or password is wrong',
    )
    expect(why(read({ isActive: false }))?.field).toBe('e-mail or password is wrong')
    expect(why(read(), 'u-eng')?.field).toBe('must be someone else')
    expect(why(read({ role: 'lead' }))).toEqual({
      code: 'validation_failed',
      message: 'countersign: use as is must be signed by engineer',
      field: 'needs engineer',
      isWrongCredentials: false,
    })
  })
})
