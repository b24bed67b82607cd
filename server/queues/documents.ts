import { Queue } from 'bullmq'
import { logger } from '../logger'
import { newQueueConnection, redisPrefix } from '../redis'

/** The queue the document worker (workers/documents.ts) takes PDF jobs from. */
export const DOCUMENTS_QUEUE = 'documents'

export interface DocumentJob {
  documentId: string
}

let queue: Queue<DocumentJob> | undefined
let connection: ReturnType<typeof newQueueConnection> | undefined

/** The producer side of the documents queue, made on first use. */
export function documentsQueue(): Queue<DocumentJob> {
  connection ??= newQueueConnection()
  queue ??= new Queue<DocumentJob>(DOCUMENTS_QUEUE, {
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
 * Enqueues a document's job with the document id as job id, so enqueueing twice (the request
 * and then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is
 * already committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueDocument(documentId: string): Promise<void> {
  try {
    await Promise.race([
      documentsQueue().add('render', { documentId }, { jobId: documentId }),
      new Promise((_, reject) =>
        setTimeout(() => reject(new Error('redis did not answer in 2 s')), 2000).unref(),
      ),
    ])
  } catch (err) {
    logger.warn({ err, documentId }, 'document not enqueued now; the sweeper will retry')
  }
}

/** Closes the producer and its connection (BullMQ leaves a connection it was given open). */
export async function closeDocumentsQueue(): Promise<void> {
  await queue?.close()
  await connection?.quit().catch(() => connection?.disconnect())
  queue = undefined
  connection = undefined
}
