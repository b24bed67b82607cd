import { makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'

/** The queue the document worker (workers/documents.ts) takes PDF jobs from. */
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
