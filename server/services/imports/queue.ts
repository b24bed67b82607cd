import type { Redis } from 'ioredis'
import { makeProducer, STANDARD_JOB_OPTIONS, startRowWorker } from '../../queue'
import type { RowWorker } from '../../queue'
import { checkImport } from './dryRun'
import { failImport, pendingImports } from './importJobs'
import { processImport } from './importRun'

/** The queue the import worker (below) takes bench-file jobs from. */
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

/** Enqueues again every import left `checking` or `queued` (its job was lost) or stuck `running`. */
export async function sweepImports(olderThanMs = 30_000): Promise<number> {
  const pending = await pendingImports(new Date(), olderThanMs)
  for (const p of pending)
    await (p.kind === 'check' ? enqueueImportCheck(p.id, p.updatedAt) : enqueueImport(p.id))
  return pending.length
}

/**
 * Checks bench files (the dry run) and records their good rows as step runs; progress goes to
 * the job and to the imports row.
 */
export function startImportsWorker(connection: Redis): RowWorker<ImportJob> {
  return startRowWorker<ImportJob>({
    queue: IMPORTS_QUEUE,
    connection,
    // One file at a time: rows of two files for one unit must not race for its step.
    concurrency: 1,
    run: async (job) => {
      const report = (percent: number) => job.updateProgress(percent)
      if (job.data.kind === 'check') await checkImport(job.data.importId, report)
      else await processImport(job.data.importId, report)
    },
    fail: (data, message) => failImport(data.importId, message),
    sweep: sweepImports,
    what: 'import',
  })
}
