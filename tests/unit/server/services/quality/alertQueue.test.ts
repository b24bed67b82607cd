import { afterAll, describe, expect, it, vi } from 'vitest'

// Nothing listens on port 1: every Redis command waits in ioredis' offline queue.
vi.hoisted(() => {
  process.env.REDIS_URL = 'redis://127.0.0.1:1'
})

const { logger } = await import('../../../../../server/logger')
const { closeAlertsQueue, enqueueAlertCheck } =
  await import('../../../../../server/services/quality/alertQueue')

afterAll(async () => {
  await Promise.race([closeAlertsQueue(), new Promise((r) => setTimeout(r, 500))])
})

describe('enqueueAlertCheck', () => {
  it('gives up after 2 s without throwing when Redis is down, and logs it', async () => {
    const warn = vi.spyOn(logger, 'warn').mockImplementation(() => undefined as never)
    const started = Date.now()
    await expect(enqueueAlertCheck('lot-1', 'step-1')).resolves.toBeUndefined()
    const waited = Date.now() - started
    expect(waited).toBeGreaterThanOrEqual(1900)
    expect(waited).toBeLessThan(4000)
    expect(warn).toHaveBeenCalledWith(
      expect.objectContaining({ lotId: 'lot-1', stepId: 'step-1' }),
      'alert check not enqueued now; the sweep will retry',
    )
  })
})
