import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../../logger'
import { redisPrefix } from '../../redis'
import { jobLocks, makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'
import { failDocument, pendingDocumentIds, renderDocument } from './documentRender'

/** The queue the document worker (below) takes PDF jobs from. */
export const DOCUMENTS_QUEUE = 'documents'

export interface DocumentJob {
  documentId: string
}

const producer = makeProducer<DocumentJob>(DOCUMENTS_QUEUE, STANDARD_JOB_OPTIONS)

/** The producer side of the documents queue, made on first use. */
export const documentsQueue = producer.queue

/**
 * Enqueues a document's job with the document id as job id, so enqueueing twice (the request
 * and then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is
 * already committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueDocument(documentId: string): Promise<void> {
  await producer.add(
    'render',
    { documentId },
    { jobId: documentId },
    { documentId },
    'document not enqueued now; the sweeper will retry',
  )
}

export const closeDocumentsQueue = producer.close

const SWEEP_EVERY_MS = 60_000

/** Enqueues again every document row left `queued` (its job was lost while Redis was down). */
export async function sweepDocuments(olderThanMs = 30_000): Promise<number> {
  const ids = await pendingDocumentIds(new Date(), olderThanMs)
  for (const id of ids) await enqueueDocument(id)
  return ids.length
}

/** Renders travelers and label sheets; progress goes to the job and to the documents row. */
export function startDocumentsWorker(connection: Redis): {
  worker: Worker<DocumentJob>
  stop: () => void
  sweepNow: () => void
} {
  const worker = new Worker<DocumentJob>(
    DOCUMENTS_QUEUE,
    async (job) => {
      await renderDocument(job.data.documentId, (percent) => job.updateProgress(percent))
    },
    { connection, prefix: redisPrefix, concurrency: 2, ...jobLocks() },
  )
  worker.on('failed', (job, err) => {
    if (job && job.attemptsMade >= (job.opts.attempts ?? 1))
      failDocument(job.data.documentId, err.message).catch((e: unknown) =>
        logger.error({ err: e, documentId: job.data.documentId }, 'could not mark document failed'),
      )
  })
  const sweep = (olderThanMs?: number) =>
    void sweepDocuments(olderThanMs).catch((err: unknown) =>
      logger.warn({ err }, 'document sweep failed'),
    )
  sweep() // on start-up: pick up what was requested while no worker or no Redis was there
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  // Redis is back: every row still queued lost its job (or it waits; the job id makes a second
  // enqueue a no-op), whatever its age.
  return { worker, stop: () => clearInterval(timer), sweepNow: () => sweep(0) }
}
