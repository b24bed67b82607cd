import { Queue } from 'bullmq'
import type { JobsOptions, WorkerOptions } from 'bullmq'
import { env } from './env'
import { logger } from './logger'
import { newQueueConnection, redisPrefix } from './redis'

/** How long an enqueue may wait for Redis before the caller goes on without it. */
const REDIS_WAIT_MS = 2000

/** Retries with exponential backoff and bounded history: what most of our queues want. */
export const STANDARD_JOB_OPTIONS: JobsOptions = {
  attempts: 3,
  backoff: { type: 'exponential', delay: 2000 },
  removeOnComplete: 200,
  removeOnFail: 500,
}

export interface Producer<J extends object> {
  /** The BullMQ queue, made with its own connection on first use. */
  queue: () => Queue<J>
  /**
   * Adds a job, waiting at most 2 s for Redis. An outage is logged with `context`, never
   * thrown: the caller's row is already committed, and a sweeper enqueues it once Redis is back.
   */
  add: (
    jobName: string,
    data: J,
    options: JobsOptions,
    context: Record<string, unknown>,
    lostMessage: string,
  ) => Promise<void>
  /** Closes the queue and its connection (BullMQ leaves a connection it was given open). */
  close: () => Promise<void>
}

/** The producer side of one queue, shared by the API and the workers that enqueue follow-ups. */
export function makeProducer<J extends object>(
  name: string,
  defaultJobOptions: JobsOptions | (() => JobsOptions),
): Producer<J> {
  let queue: Queue<J> | undefined
  let connection: ReturnType<typeof newQueueConnection> | undefined
  const get = () => {
    if (queue) return queue
    connection ??= newQueueConnection()
    queue = new Queue<J>(name, {
      connection,
      prefix: redisPrefix,
      defaultJobOptions:
        typeof defaultJobOptions === 'function' ? defaultJobOptions() : defaultJobOptions,
    })
    // Without a listener BullMQ prints every reconnect failure; the connection already logs
    // each outage once (server/redis.ts).
    queue.on('error', () => undefined)
    return queue
  }
  return {
    queue: get,
    async add(jobName, data, options, context, lostMessage) {
      try {
        await Promise.race([
          // BullMQ's name and data types are inferred per queue; ours are plain objects.
          (get() as unknown as Queue).add(jobName, data, options),
          new Promise((_, reject) =>
            setTimeout(
              () => reject(new Error(`redis did not answer in ${REDIS_WAIT_MS / 1000} s`)),
              REDIS_WAIT_MS,
            ).unref(),
          ),
        ])
      } catch (err) {
        logger.warn({ err, ...context }, lostMessage)
      }
    },
    async close() {
      await queue?.close()
      await connection?.quit().catch(() => connection?.disconnect())
      queue = undefined
      connection = undefined
    },
  }
}

/**
 * How long a worker holds a job before BullMQ counts it stalled, and how often the workers look
 * for stalled jobs: a worker that dies mid-job (killed, out of memory) leaves its job to be run
 * again by another one after at most about the sum of the two.
 */
export function jobLocks(): Pick<WorkerOptions, 'lockDuration' | 'stalledInterval'> {
  return { lockDuration: env.WAYMARK_JOB_LOCK_MS, stalledInterval: env.WAYMARK_JOB_STALL_CHECK_MS }
}
