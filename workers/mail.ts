import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../server/logger'
import { enqueueMail, MAIL_QUEUE } from '../server/services/mail'
import type { MailJob } from '../server/services/mail'
import { redisPrefix } from '../server/redis'
import { jobLocks } from './locks'
import { failEmail, pendingEmailIds, sendEmail } from '../server/services/mail'

export { enqueueMail, MAIL_QUEUE }
export type { MailJob }

const SWEEP_EVERY_MS = 60_000

/** Enqueues again every e-mail left `queued` (its job was lost while Redis was down). */
export async function sweepMail(olderThanMs = 120_000): Promise<number> {
  const ids = await pendingEmailIds(new Date(), olderThanMs)
  for (const id of ids) await enqueueMail(id)
  return ids.length
}

/** Sends queued e-mails; the row records each attempt, the result and, at the end, any failure. */
export function startMailWorker(connection: Redis): {
  worker: Worker<MailJob>
  stop: () => void
  sweepNow: () => void
} {
  const worker = new Worker<MailJob>(MAIL_QUEUE, (job) => sendEmail(job.data.emailId), {
    connection,
    prefix: redisPrefix,
    concurrency: 2,
    ...jobLocks(),
  })
  worker.on('failed', (job, err) => {
    if (job && job.attemptsMade >= (job.opts.attempts ?? 1))
      failEmail(job.data.emailId, err.message).catch((e: unknown) =>
        logger.error({ err: e, emailId: job.data.emailId }, 'could not mark e-mail failed'),
      )
  })
  const sweep = (olderThanMs?: number) =>
    void sweepMail(olderThanMs).catch((err: unknown) => logger.warn({ err }, 'mail sweep failed'))
  sweep() // on start-up: pick up what was queued while no worker or no Redis was there
  const timer = setInterval(sweep, SWEEP_EVERY_MS)
  timer.unref()
  // Redis is back: a queued row's job was lost or still waits (the job id dedupes), whatever its age.
  return { worker, stop: () => clearInterval(timer), sweepNow: () => sweep(0) }
}
