import type { Redis } from 'ioredis'
import { makeProducer, STANDARD_JOB_OPTIONS, startRowWorker } from '../../queue'
import type { RowWorker } from '../../queue'
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

/** Enqueues again every document row left `queued` (its job was lost while Redis was down). */
export async function sweepDocuments(olderThanMs = 30_000): Promise<number> {
  const ids = await pendingDocumentIds(new Date(), olderThanMs)
  for (const id of ids) await enqueueDocument(id)
  return ids.length
}

/** Renders travelers and label sheets; progress goes to the job and to the documents row. */
export function startDocumentsWorker(connection: Redis): RowWorker<DocumentJob> {
  return startRowWorker<DocumentJob>({
    queue: DOCUMENTS_QUEUE,
    connection,
    concurrency: 2,
    run: (job) => renderDocument(job.data.documentId, (percent) => job.updateProgress(percent)),
    fail: (data, message) => failDocument(data.documentId, message),
    sweep: sweepDocuments,
    what: 'document',
  })
}
