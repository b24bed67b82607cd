import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'

const add = vi.fn(async () => undefined)
vi.mock('../../../../../server/queue', () => ({
  STANDARD_JOB_OPTIONS: {},
  makeProducer: () => ({ add, queue: () => null, close: async () => undefined }),
}))

const { ALERT_THROTTLE_MS, enqueueAlertCheck } =
  await import('../../../../../server/services/quality/alertQueue')

describe('enqueueAlertCheck throttle', () => {
  beforeEach(() => {
    vi.useFakeTimers()
    add.mockClear()
  })
  afterEach(() => {
    vi.runOnlyPendingTimers()
    vi.useRealTimers()
  })

  it('sends one ask for a burst at one lot step, and one more after the window', async () => {
    for (let i = 0; i < 5; i++) await enqueueAlertCheck('lot-a', 'step-1')
    expect(add).toHaveBeenCalledTimes(1)
    vi.advanceTimersByTime(ALERT_THROTTLE_MS)
    expect(add).toHaveBeenCalledTimes(2)
    // The trailing ask opened a window of its own, with nothing asked during it.
    vi.advanceTimersByTime(ALERT_THROTTLE_MS)
    expect(add).toHaveBeenCalledTimes(2)
  })

  it('sends no trailing ask when nothing came during the window', async () => {
    await enqueueAlertCheck('lot-b', 'step-1')
    vi.advanceTimersByTime(ALERT_THROTTLE_MS)
    expect(add).toHaveBeenCalledTimes(1)
  })

  it('keeps lot steps apart', async () => {
    await enqueueAlertCheck('lot-c', 'step-1')
    await enqueueAlertCheck('lot-c', 'step-2')
    await enqueueAlertCheck('lot-d', 'step-1')
    expect(add.mock.calls.map((c) => (c as unknown[])[1])).toEqual([
      { lotId: 'lot-c', stepId: 'step-1' },
      { lotId: 'lot-c', stepId: 'step-2' },
      { lotId: 'lot-d', stepId: 'step-1' },
    ])
  })
})
