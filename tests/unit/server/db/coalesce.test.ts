import { describe, expect, it } from 'vitest'
import { coalesce } from '../../../../server/db/coalesce'

/** A batch function that records every batch it was given and answers after `release()`. */
function recorder(fail?: (items: number[]) => boolean) {
  const batches: number[][] = []
  const pending: (() => void)[] = []
  const run = (items: number[]) =>
    new Promise<number[]>((resolve, reject) => {
      batches.push(items)
      pending.push(() =>
        fail?.(items)
          ? reject(new Error(`bad ${items.join(',')}`))
          : resolve(items.map((i) => i * 10)),
      )
    })
  const release = () => pending.splice(0).forEach((go) => go())
  return { batches, run, release }
}

const tick = () => new Promise((r) => setImmediate(r))

describe('coalesce', () => {
  it('sends calls made in one turn of the event loop as one batch, answering each in order', async () => {
    const r = recorder()
    const call = coalesce(r.run)
    const answers = Promise.all([1, 2, 3].map(call))
    await tick()
    r.release()
    expect(await answers).toEqual([10, 20, 30])
    expect(r.batches).toEqual([[1, 2, 3]])
  })

  it('holds calls while maxInFlight batches run, then sends them together', async () => {
    const r = recorder()
    const call = coalesce(r.run, { maxInFlight: 1 })
    const first = call(1)
    await tick()
    const later = Promise.all([2, 3, 4].map(call))
    await tick()
    expect(r.batches).toEqual([[1]])
    r.release()
    expect(await first).toBe(10)
    await tick()
    await tick()
    expect(r.batches).toEqual([[1], [2, 3, 4]])
    r.release()
    expect(await later).toEqual([20, 30, 40])
  })

  it('caps a batch at maxBatch calls', async () => {
    const r = recorder()
    const call = coalesce(r.run, { maxInFlight: 2, maxBatch: 2 })
    const answers = Promise.all([1, 2, 3, 4, 5].map(call))
    await tick()
    expect(r.batches).toEqual([
      [1, 2],
      [3, 4],
    ])
    r.release()
    await tick()
    await tick()
    r.release()
    expect(await answers).toEqual([10, 20, 30, 40, 50])
  })

  it('runs a failed batch again one call at a time, so only the bad call fails', async () => {
    const r = recorder((items) => items.includes(2))
    const call = coalesce(r.run)
    const settled = Promise.allSettled([1, 2, 3].map(call))
    await tick()
    r.release()
    await tick()
    r.release()
    const out = await settled
    expect(out.map((o) => o.status)).toEqual(['fulfilled', 'rejected', 'fulfilled'])
    expect((out[1] as PromiseRejectedResult).reason).toEqual(new Error('bad 2'))
    expect(r.batches).toEqual([[1, 2, 3], [1], [2], [3]])
  })
})
