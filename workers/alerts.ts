import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../server/logger'
import { ALERTS_QUEUE, alertJobKey, alertsQueue, enqueueAlertCheck } from '../server/services/quality'
import type { AlertJob } from '../server/services/quality'
import { redisPrefix } from '../server/redis'
import { jobLocks } from './locks'
import { evaluateLotStep, lotStepsRunSince } from '../server/services/quality'

export { ALERTS_QUEUE, enqueueAlertCheck }
export type { AlertJob }

const SWEEP_EVERY_MS = 5 * 60_000
/** On start-up the sweep looks back this far: scans made while no worker or no Redis was there. */
const FIRST_SWEEP_LOOKBACK_MS = 24 * 3600_000
/** Each later sweep starts a little before the previous one did, so no run falls in a gap. */
const SWEEP_OVERLAP_MS = 60_000

/** The job: re-evaluate one lot's step and raise (store and e-mail) any new alert. */
export async function processAlertJob(data: AlertJob): Promise<{ raised: number }> {
  return { raised: await evaluateLotStep(data.lotId, data.stepId) }
}

/**
 * Enqueues a re-evaluation of every lot and step with a run finished since `since` (the jobs a
 * Redis outage lost). Throws when Redis does not take them, so the caller keeps its `since`.
 */
export async function sweepAlerts(since: Date): Promise<number> {
  const pairs = await lotStepsRunSince(since)
  for (const { lotId, stepId } of pairs)
    await alertsQueue().add(
      'evaluate',
      { lotId, stepId },
      { deduplication: { id: alertJobKey(lotId, stepId), keepLastIfActive: true } },
    )
  return pairs.length
}

/** Evaluates alert jobs one at a time per worker process, and sweeps every few minutes. */
export function startAlertsWorker(connection: Redis): {
  worker: Worker<AlertJob>
  stop: () => void
  sweepNow: () => void
} {
  const worker = new Worker<AlertJob>(ALERTS_QUEUE, (job) => processAlertJob(job.data), {
    connection,
    prefix: redisPrefix,
    concurrency: 2,
    ...jobLocks(),
  })
  let since = new Date(Date.now() - FIRST_SWEEP_LOOKBACK_MS)
  let isSweeping = false
  const sweep = () => {
    if (isSweeping) return
    isSweeping = true
    const startedAt = new Date()
    void sweepAlerts(since)
      .then(() => {
        since = new Date(startedAt.getTime() - SWEEP_OVERLAP_MS)
      })
      .catch((err: unknown) => logger.warn({ err }, 'alert sweep failed; the next one retries'))
      .finally(() => {
        isSweeping = false
      })
  }
  sweep()
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  return { worker, stop: () => clearInterval(timer), sweepNow: sweep }
}
