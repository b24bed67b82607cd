import { Queue, Worker } from 'bullmq'
import type { Job, JobsOptions, WorkerOptions } from 'bullmq'
import type { Redis } from 'ioredis'
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

/** How often a row worker enqueues again the rows whose jobs were lost. */
const SWEEP_EVERY_MS = 60_000

/** A worker for jobs that each stand for one row, and its sweeper (startRowWorker). */
export interface RowWorker<J extends object> {
  worker: Worker<J>
  /** Stops the sweeper's timer; close the worker itself after. */
  stop: () => void
  /** Sweeps now, rows of any age: Redis is back, and every row still waiting lost its job. */
  sweepNow: () => void
}

/**
 * Starts the worker of a queue whose jobs each stand for one row (a document, an e-mail, an
 * import) that was committed before its job was enqueued. A job that fails its last attempt marks
 * its row failed. The sweeper enqueues rows left waiting (their job lost while Redis was down) on
 * start-up, then every minute; the job id dedupes a job that was only waiting.
 */
export function startRowWorker<J extends object>(options: {
  queue: string
  connection: Redis
  concurrency: number
  /** Does the job's work. */
  run: (job: Job<J>) => Promise<unknown>
  /** Marks the job's row failed, with the last error's message. */
  fail: (data: J, message: string) => Promise<unknown>
  /** Enqueues again the rows waiting longer than `olderThanMs` (the sweep's own default if absent). */
  sweep: (olderThanMs?: number) => Promise<unknown>
  /** What a row is, for the logs: `document`, `e-mail`, `import`. */
  what: string
}): RowWorker<J> {
  const { what } = options
  const worker = new Worker<J>(options.queue, (job) => options.run(job), {
    connection: options.connection,
    prefix: redisPrefix,
    concurrency: options.concurrency,
    ...jobLocks(),
  })
  worker.on('failed', (job, err) => {
    if (job && job.attemptsMade >= (job.opts.attempts ?? 1))
      options.fail(job.data, err.message).catch((e: unknown) => {
        // The job's data names its row (documentId, emailId, importId).
        const fields: Record<string, unknown> = { err: e, ...(job.data as object) }
        logger.error(fields, `could not mark ${what} failed`)
      })
  })
  const sweep = (olderThanMs?: number) =>
    void options
      .sweep(olderThanMs)
      .catch((err: unknown) => logger.warn({ err }, `${what} sweep failed`))
  sweep() // on start-up: pick up what was requested while no worker or no Redis was there
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  return { worker, stop: () => clearInterval(timer), sweepNow: () => sweep(0) }
}
