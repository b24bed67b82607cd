import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../../logger'
import { redisPrefix } from '../../redis'
import { jobLocks, makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'
import { evaluateLotStep, lotStepsRunSince, sendDueDigests } from './alerts'

/** The queue the alerts worker (below) takes "re-evaluate this lot's step" jobs from. */
export const ALERTS_QUEUE = 'alerts'

/** Re-evaluate a lot's step, or (`leadId`) send a lead's digest once its window is over. */
export type AlertJob = { lotId: string; stepId: string } | { leadId: string }

const producer = makeProducer<AlertJob>(ALERTS_QUEUE, STANDARD_JOB_OPTIONS)

/** The producer side of the alerts queue, made on first use. */
export const alertsQueue = producer.queue

/** The deduplication id of a lot's step: one waiting job per lot and step at any time. */
export function alertJobKey(lotId: string, stepId: string): string {
  return `${lotId}:${stepId}`
}

/** How long a lot's step waits after one re-evaluation request before it sends the next. */
export const ALERT_THROTTLE_MS = 250

/** Lot steps asked for within the throttle window, and whether another ask came meanwhile. */
const recent = new Map<string, { isPending: boolean }>()

/**
 * Asks for a re-evaluation of a lot's step. A burst of scans at one step leaves one waiting job
 * (BullMQ deduplication on lot + step); a scan while that job runs keeps one more to run after
 * it (`keepLastIfActive`), so the last scan of a burst is never judged on figures read before
 * it. This process also sends at most one ask per lot step every ALERT_THROTTLE_MS, and one more
 * at the end of the window when scans came during it, so a busy station costs Redis one call
 * per window instead of one per scan. A Redis outage is logged, not thrown: the scan is already
 * saved, and the worker's sweep re-evaluates recently run steps once Redis is back.
 */
export async function enqueueAlertCheck(lotId: string, stepId: string): Promise<void> {
  const key = alertJobKey(lotId, stepId)
  const window = recent.get(key)
  if (window) {
    window.isPending = true
    return
  }
  recent.set(key, { isPending: false })
  setTimeout(() => {
    const ended = recent.get(key)
    recent.delete(key)
    if (ended?.isPending) void enqueueAlertCheck(lotId, stepId)
  }, ALERT_THROTTLE_MS).unref()
  await producer.add(
    'evaluate',
    { lotId, stepId },
    { deduplication: { id: key, keepLastIfActive: true } },
    { lotId, stepId },
    'alert check not enqueued now; the sweep will retry',
  )
}

export const closeAlertsQueue = producer.close

const SWEEP_EVERY_MS = 5 * 60_000
/** On start-up the sweep looks back this far: scans made while no worker or no Redis was there. */
const FIRST_SWEEP_LOOKBACK_MS = 24 * 3600_000
/** Each later sweep starts a little before the previous one did, so no run falls in a gap. */
const SWEEP_OVERLAP_MS = 60_000

/**
 * Schedules a lead's digest for when its window is over: one delayed job per lead and due time
 * (the job id), so asking twice leaves one. A lost job is made up by the sweep.
 */
export async function enqueueDigest(leadId: string, dueAt: Date): Promise<void> {
  await producer.add(
    'digest',
    { leadId },
    {
      jobId: `digest-${leadId}-${dueAt.getTime()}`,
      delay: Math.max(0, dueAt.getTime() - Date.now()),
    },
    { leadId },
    'alert digest not scheduled now; the sweep will send it',
  )
}

/**
 * The job: re-evaluate one lot's step (store and e-mail new episodes, end those back in control),
 * or send the digests that are due. Digests still in their window are scheduled for its end.
 */
export async function processAlertJob(
  data: AlertJob,
): Promise<{ raised: number; ended: number } | { sent: number }> {
  if ('leadId' in data) {
    const { sent, later } = await sendDueDigests()
    for (const d of later) await enqueueDigest(d.leadId, d.dueAt)
    return { sent }
  }
  const { raised, ended, digests } = await evaluateLotStep(data.lotId, data.stepId)
  for (const d of digests) await enqueueDigest(d.leadId, d.dueAt)
  return { raised, ended }
}

/**
 * Enqueues a re-evaluation of every lot and step with a run finished since `since` (the jobs a
 * Redis outage lost). Throws when Redis does not take them, so the caller keeps its `since`.
 */
export async function sweepAlerts(since: Date): Promise<number> {
  // Digests whose job was lost: send those due, schedule the rest.
  const { later } = await sendDueDigests()
  for (const d of later) await enqueueDigest(d.leadId, d.dueAt)
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
