import { describe, expect, it } from 'vitest'
import type { IncrementResponse, Options, Store } from 'express-rate-limit'
import { RedisOrMemoryStore } from '../../../../server/middleware/rateLimits'

/** A stand-in for the Redis store that can be switched off, as Redis going away would. */
class SwitchableStore implements Store {
  isUp = true
  inits = 0
  hits = new Map<string, number>()
  init(): Promise<void> {
    this.inits++
    // As rate-limit-redis does: loading its scripts fails while Redis is away.
    return this.isUp ? Promise.resolve() : Promise.reject(new Error('connect ECONNREFUSED'))
  }
  private check() {
    if (!this.isUp) throw new Error('connect ECONNREFUSED 127.0.0.1:56379')
  }
  increment(key: string): IncrementResponse {
    this.check()
    const totalHits = (this.hits.get(key) ?? 0) + 1
    this.hits.set(key, totalHits)
    return { totalHits, resetTime: undefined }
  }
  decrement(key: string): void {
    this.check()
    this.hits.set(key, (this.hits.get(key) ?? 1) - 1)
  }
  resetKey(key: string): void {
    this.check()
    this.hits.delete(key)
  }
}

describe('RedisOrMemoryStore', () => {
  it('counts in Redis, in memory while Redis is away, and in Redis again once it answers', async () => {
    const redis = new SwitchableStore()
    const store = new RedisOrMemoryStore(redis, 'account')
    store.init({ windowMs: 60_000 } as Options)
    try {
      expect((await store.increment('a@x')).totalHits).toBe(1)
      expect(redis.hits.get('a@x')).toBe(1)

      redis.isUp = false
      // The outage neither throws at the request nor lifts the limit: memory counts meanwhile.
      expect((await store.increment('a@x')).totalHits).toBe(1)
      expect((await store.increment('a@x')).totalHits).toBe(2)
      await store.decrement('a@x')
      expect((await store.increment('a@x')).totalHits).toBe(2)

      redis.isUp = true
      expect((await store.increment('a@x')).totalHits).toBe(2)
      expect(redis.hits.get('a@x')).toBe(2)
    } finally {
      store.shutdown()
    }
  })

  it('starts while Redis is away and loads the Redis store once Redis answers', async () => {
    const redis = new SwitchableStore()
    redis.isUp = false
    const store = new RedisOrMemoryStore(redis, 'ip')
    // No unhandled rejection from the failed start-up: vitest fails the run on one.
    store.init({ windowMs: 60_000 } as Options)
    try {
      expect((await store.increment('127.0.0.1')).totalHits).toBe(1)
      redis.isUp = true
      expect((await store.increment('127.0.0.1')).totalHits).toBe(1)
      expect(redis.hits.get('127.0.0.1')).toBe(1)
      expect(redis.inits).toBeGreaterThanOrEqual(2)
    } finally {
      store.shutdown()
    }
  })
})
