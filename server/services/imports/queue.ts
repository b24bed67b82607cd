import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../../logger'
import { redisPrefix } from '../../redis'
import { jobLocks, makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'
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

const SWEEP_EVERY_MS = 60_000

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
export function startImportsWorker(connection: Redis): {
  worker: Worker<ImportJob>
  stop: () => void
  sweepNow: () => void
} {
  const worker = new Worker<ImportJob>(
    IMPORTS_QUEUE,
    async (job) => {
      const report = (percent: number) => job.updateProgress(percent)
      if (job.data.kind === 'check') await checkImport(job.data.importId, report)
      else await processImport(job.data.importId, report)
    },
    // One file at a time: rows of two files for one unit must not race for its step.
    { connection, prefix: redisPrefix, concurrency: 1, ...jobLocks() },
  )
  worker.on('failed', (job, err) => {
    if (job && job.attemptsMade >= (job.opts.attempts ?? 1))
      failImport(job.data.importId, err.message).catch((e: unknown) =>
        logger.error({ err: e, importId: job.data.importId }, 'could not mark import failed'),
      )
  })
  const sweep = (olderThanMs?: number) =>
    void sweepImports(olderThanMs).catch((err: unknown) =>
      logger.warn({ err }, 'import sweep failed'),
    )
  sweep() // on start-up: pick up what was requested while no worker or no Redis was there
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  return { worker, stop: () => clearInterval(timer), sweepNow: () => sweep(0) }
}
