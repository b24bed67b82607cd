import { makeProducer, STANDARD_JOB_OPTIONS } from './producer'

/** The queue the alerts worker (workers/alerts.ts) takes "re-evaluate this lot's step" jobs from. */
export const ALERTS_QUEUE = 'alerts'

export interface AlertJob {
  lotId: string
  stepId: string
}

const producer = makeProducer<AlertJob>(ALERTS_QUEUE, STANDARD_JOB_OPTIONS)

/** The producer side of the alerts queue, made on first use. */
export const alertsQueue = producer.queue

/** The deduplication id of a lot's step: one waiting job per lot and step at any time. */
export function alertJobKey(lotId: string, stepId: string): string {
  return `${lotId}:${stepId}`
}

/**
 * Asks for a re-evaluation of a lot's step. A burst of scans at one step leaves one waiting job
 * (BullMQ deduplication on lot + step); a scan while that job runs keeps one more to run after
 * it (`keepLastIfActive`), so the last scan of a burst is never judged on figures read before
 * it. A Redis outage is logged, not thrown: the scan is already saved, and the worker's sweep
 * re-evaluates recently run steps once Redis is back.
 */
export async function enqueueAlertCheck(lotId: string, stepId: string): Promise<void> {
  await producer.add(
    'evaluate',
    { lotId, stepId },
    { deduplication: { id: alertJobKey(lotId, stepId), keepLastIfActive: true } },
    { lotId, stepId },
    'alert check not enqueued now; the sweep will retry',
  )
}

export const closeAlertsQueue = producer.close
