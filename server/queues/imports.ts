import { makeProducer, STANDARD_JOB_OPTIONS } from './producer'

/** The queue the import worker (workers/imports.ts) takes bench-file jobs from. */
export const IMPORTS_QUEUE = 'imports'

export interface ImportJob {
  importId: string
}

const producer = makeProducer<ImportJob>(IMPORTS_QUEUE, STANDARD_JOB_OPTIONS)

/** The producer side of the imports queue, made on first use. */
export const importsQueue = producer.queue

/**
 * Enqueues an import's job with the import id as job id, so enqueueing twice (the request
 * and then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is
 * already committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueImport(importId: string): Promise<void> {
  await producer.add(
    'import',
    { importId },
    { jobId: importId },
    { importId },
    'import not enqueued now; the sweeper will retry',
  )
}

export const closeImportsQueue = producer.close
