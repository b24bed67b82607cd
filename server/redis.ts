import { Redis } from 'ioredis'
import { env } from './env'
import { logger } from './logger'

let shared: Redis | undefined

function withErrorLog(redis: Redis, role: string): Redis {
  // ioredis reconnects by itself; log the first failure of each outage, not every retry.
  let isDown = false
  redis.on('error', (err) => {
    if (!isDown) logger.warn({ err: err.message, role }, 'redis unreachable, retrying')
    isDown = true
  })
  redis.on('ready', () => {
    if (isDown) logger.info({ role }, 'redis reachable again')
    isDown = false
  })
  return redis
}

/**
 * The API's Redis connection (rate limits, health). A command gives up after one reconnect
 * attempt, so a Redis outage makes a request fail fast instead of hanging.
 */
export function redisConnection(): Redis {
  shared ??= withErrorLog(new Redis(env.redisUrl, { maxRetriesPerRequest: 1 }), 'api')
  return shared
}

/**
 * A fresh connection for BullMQ. `maxRetriesPerRequest: null` is what BullMQ requires: its
 * workers wait out a Redis outage rather than fail their blocking calls.
 */
export function newQueueConnection(): Redis {
  return withErrorLog(new Redis(env.redisUrl, { maxRetriesPerRequest: null }), 'queue')
}

/** The key prefix for everything Waymark keeps in Redis; tests use their own. */
export const redisPrefix = env.WAYMARK_REDIS_PREFIX

export async function closeRedis(): Promise<void> {
  if (!shared) return
  await shared.quit().catch(() => shared?.disconnect())
  shared = undefined
}
