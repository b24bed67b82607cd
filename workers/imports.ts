import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../server/logger'
import { enqueueImport, enqueueImportCheck, IMPORTS_QUEUE } from '../server/services/imports'
import type { ImportJob } from '../server/services/imports'
import { redisPrefix } from '../server/redis'
import { jobLocks } from './locks'
import { checkImport, failImport, pendingImports, processImport } from '../server/services/imports'

export { enqueueImport, IMPORTS_QUEUE }
export type { ImportJob }

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
