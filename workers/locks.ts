import type { WorkerOptions } from 'bullmq'
import { env } from '../server/env'

/**
 * How long a worker holds a job before BullMQ counts it stalled, and how often the workers look
 * for stalled jobs: a worker that dies mid-job (killed, out of memory) leaves its job to be run
 * again by another one after at most about the sum of the two.
 */
export function jobLocks(): Pick<WorkerOptions, 'lockDuration' | 'stalledInterval'> {
  return { lockDuration: env.WAYMARK_JOB_LOCK_MS, stalledInterval: env.WAYMARK_JOB_STALL_CHECK_MS }
}
