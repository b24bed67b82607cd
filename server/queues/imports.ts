import { Queue } from 'bullmq'
import { logger } from '../logger'
import { newQueueConnection, redisPrefix } from '../redis'

/** The queue the import worker (workers/imports.ts) takes bench-file jobs from. */
export const IMPORTS_QUEUE = 'imports'

export interface ImportJob {
  importId: string
}

let queue: Queue<ImportJob> | undefined
let connection: ReturnType<typeof newQueueConnection> | undefined

/** The producer side of the imports queue, made on first use. */
export function importsQueue(): Queue<ImportJob> {
  connection ??= newQueueConnection()
  queue ??= new Queue<ImportJob>(IMPORTS_QUEUE, {
    connection,
    prefix: redisPrefix,
    defaultJobOptions: {
      attempts: 3,
      backoff: { type: 'exponential', delay: 2000 },
      removeOnComplete: 200,
      removeOnFail: 500,
    },
  })
  return queue
}

/**
 * Enqueues an import's job with the import id as job id, so enqueueing twice (the request
 * and then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is
 * already committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueImport(importId: string): Promise<void> {
  try {
    await Promise.race([
      importsQueue().add('import', { importId }, { jobId: importId }),
      new Promise((_, reject) =>
        setTimeout(() => reject(new Error('redis did not answer in 2 s')), 2000).unref(),
      ),
    ])
  } catch (err) {
    logger.warn({ err, importId }, 'import not enqueued now; the sweeper will retry')
  }
}

/** Closes the producer and its connection (BullMQ leaves a connection it was given open). */
export async function closeImportsQueue(): Promise<void> {
  await queue?.close()
  await connection?.quit().catch(() => connection?.disconnect())
  queue = undefined
  connection = undefined
}
