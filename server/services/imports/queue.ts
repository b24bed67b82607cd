import { makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'

/** The queue the import worker (workers/imports.ts) takes bench-file jobs from. */
export const IMPORTS_QUEUE = 'imports'

export interface ImportJob {
  importId: string
  /** The dry run (plan every row) or the import (record the good ones); absent: the import. */
  kind?: 'check' | 'run'
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

/**
 * Enqueues an import's dry run. The job id carries the moment the dry run was asked for, so the
 * sweeper's second enqueue of the same request is a no-op while a new request gets a new job.
 */
export async function enqueueImportCheck(importId: string, requestedAt: Date): Promise<void> {
  await producer.add(
    'check',
    { importId, kind: 'check' },
    { jobId: `check-${importId}-${requestedAt.getTime()}` },
    { importId },
    'dry run not enqueued now; the sweeper will retry',
  )
}
