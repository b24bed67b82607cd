import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../server/logger'
import { enqueueImport, IMPORTS_QUEUE } from '../server/queues/imports'
import type { ImportJob } from '../server/queues/imports'
import { redisPrefix } from '../server/redis'
import { failImport, pendingImportIds, processImport } from '../server/services/imports'

export { enqueueImport, IMPORTS_QUEUE }
export type { ImportJob }

const SWEEP_EVERY_MS = 60_000

/** Enqueues again every import left `queued` (its job was lost) or stuck `running`. */
export async function sweepImports(olderThanMs = 30_000): Promise<number> {
  const ids = await pendingImportIds(new Date(), olderThanMs)
  for (const id of ids) await enqueueImport(id)
  return ids.length
}

/** Records bench files' rows as step runs; progress goes to the job and to the imports row. */
export function startImportsWorker(connection: Redis): {
  worker: Worker<ImportJob>
  stop: () => void
} {
  const worker = new Worker<ImportJob>(
    IMPORTS_QUEUE,
    async (job) => {
      await processImport(job.data.importId, (percent) => job.updateProgress(percent))
    },
    // One file at a time: rows of two files for one unit must not race for its step.
    { connection, prefix: redisPrefix, concurrency: 1 },
  )
  worker.on('failed', (job, err) => {
    if (job && job.attemptsMade >= (job.opts.attempts ?? 1))
      void failImport(job.data.importId, err.message)
  })
  const sweep = () =>
    void sweepImports().catch((err: unknown) => logger.warn({ err }, 'import sweep failed'))
  sweep() // on start-up: pick up what was requested while no worker or no Redis was there
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  return { worker, stop: () => clearInterval(timer) }
}
