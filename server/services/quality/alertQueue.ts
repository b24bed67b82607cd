import { makeProducer, STANDARD_JOB_OPTIONS } from '../../queue'

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
