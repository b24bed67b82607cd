import { describe, expect, it } from 'vitest'
import { CONFLICT_RETRIES, isRetryableConflict, retryOnConflict } from '../../../../server/db/retry'

// SQLSTATE 40P01 deadlock_detected and 40001 serialization_failure: PostgreSQL documentation,
// Appendix A "PostgreSQL Error Codes".
const deadlock = () => Object.assign(new Error('deadlock detected'), { code: '40P01' })

describe('retryOnConflict', () => {
  it('knows a deadlock and a serialization failure, from pg or wrapped by Sequelize', () => {
    expect(isRetryableConflict(deadlock())).toBe(true)
    expect(isRetryableConflict({ parent: { code: '40001' } })).toBe(true)
    expect(isRetryableConflict({ parent: { code: '23505' } })).toBe(false)
    expect(isRetryableConflict(new Error('no code'))).toBe(false)
  })

  it('runs the work again after a conflict, and answers its result', async () => {
    let calls = 0
    const out = await retryOnConflict(async () => {
      if (++calls < 3) throw deadlock()
      return 'done'
    })
    expect([out, calls]).toEqual(['done', 3])
  })

  it('gives up after a bounded number of retries, and never retries other errors', async () => {
    let calls = 0
    await expect(
      retryOnConflict(async () => {
        calls++
        throw deadlock()
      }),
    ).rejects.toMatchObject({ code: '40P01' })
    expect(calls).toBe(CONFLICT_RETRIES + 1)
    calls = 0
    await expect(
      retryOnConflict(async () => {
        calls++
        throw new Error('bad input')
      }),
    ).rejects.toThrow('bad input')
    expect(calls).toBe(1)
  })
})
