import { Queue, Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../logger'
import { redisPrefix } from '../redis'
import { jobLocks } from '../queue'
import { sweepExpiredSessions } from '../services/auth'

/** Housekeeping that every deployment needs once, not once per API process. */
export const MAINTENANCE_QUEUE = 'maintenance'

export type MaintenanceJob = { kind: 'sweep-sessions' }

const SWEEP_EVERY_MS = 15 * 60 * 1000

/**
 * Schedules the session sweep. A job scheduler with a fixed id is idempotent: every worker
 * process may call this at start-up and Redis still holds one schedule.
 */
export async function scheduleMaintenance(connection: Redis): Promise<void> {
  const queue = new Queue<MaintenanceJob>(MAINTENANCE_QUEUE, { connection, prefix: redisPrefix })
  await queue.upsertJobScheduler(
    'sweep-sessions',
    { every: SWEEP_EVERY_MS },
    {
      name: 'sweep-sessions',
      data: { kind: 'sweep-sessions' },
      opts: { attempts: 3, backoff: { type: 'exponential', delay: 5000 } },
    },
  )
  await queue.close()
}

/** Runs maintenance jobs; each is safe to run twice. */
export function startMaintenanceWorker(connection: Redis): Worker<MaintenanceJob> {
  return new Worker<MaintenanceJob>(
    MAINTENANCE_QUEUE,
    async (job) => {
      if (job.data.kind === 'sweep-sessions') {
        const swept = await sweepExpiredSessions(new Date())
        logger.info({ swept }, 'expired sessions swept')
        return { swept }
      }
      return null
    },
    { connection, prefix: redisPrefix, concurrency: 1, ...jobLocks() },
  )
}
