import { Queue } from 'bullmq'
import { logger } from '../logger'
import { newQueueConnection, redisPrefix } from '../redis'

/** The queue the alerts worker (workers/alerts.ts) takes "re-evaluate this lot's step" jobs from. */
export const ALERTS_QUEUE = 'alerts'

export interface AlertJob {
  lotId: string
  stepId: string
}

let queue: Queue<AlertJob> | undefined
let connection: ReturnType<typeof newQueueConnection> | undefined

/** The producer side of the alerts queue, made on first use. */
export function alertsQueue(): Queue<AlertJob> {
  if (queue) return queue
  connection ??= newQueueConnection()
  queue = new Queue<AlertJob>(ALERTS_QUEUE, {
    connection,
    prefix: redisPrefix,
    defaultJobOptions: {
      attempts: 3,
      backoff: { type: 'exponential', delay: 2000 },
      removeOnComplete: 200,
      removeOnFail: 500,
    },
  })
  // Without a listener BullMQ prints every reconnect failure; the connection already logs each
  // outage once (server/redis.ts).
  queue.on('error', () => undefined)
  return queue
}

/** The deduplication id of a lot's step: one waiting job per lot and step at any time. */
export function alertJobKey(lotId: string, stepId: string): string {
  return `${lotId}:${stepId}`
}

/**
 * Asks for a re-evaluation of a lot's step. A burst of scans at one step leaves one waiting job
 * (BullMQ deduplication on lot + step); a scan while that job runs keeps one more to run after
 * it (`keepLastIfActive`), so the last scan of a burst is never judged on figures read before
 * it. A Redis outage is logged, not thrown: the scan is already saved, and the worker's sweep
 * re-evaluates recently run steps once Redis is back.
 */
export async function enqueueAlertCheck(lotId: string, stepId: string): Promise<void> {
  try {
    await Promise.race([
      alertsQueue().add(
        'evaluate',
        { lotId, stepId },
        { deduplication: { id: alertJobKey(lotId, stepId), keepLastIfActive: true } },
      ),
      new Promise((_, reject) =>
        setTimeout(() => reject(new Error('redis did not answer in 2 s')), 2000).unref(),
      ),
    ])
  } catch (err) {
    logger.warn({ err, lotId, stepId }, 'alert check not enqueued now; the sweep will retry')
  }
}

/** Closes the producer and its connection (BullMQ leaves a connection it was given open). */
export async function closeAlertsQueue(): Promise<void> {
  await queue?.close()
  await connection?.quit().catch(() => connection?.disconnect())
  queue = undefined
  connection = undefined
}
