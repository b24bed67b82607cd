import { env } from '../../env'
import { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../../logger'
import { redisPrefix } from '../../redis'
import { jobLocks, makeProducer } from '../../queue'
import { failEmail, pendingEmailIds, sendEmail } from './mailDelivery'

/** The queue the mail worker (below) takes e-mails to send from. */
export const MAIL_QUEUE = 'mail'

export interface MailJob {
  emailId: string
}

const producer = makeProducer<MailJob>(MAIL_QUEUE, () => ({
  // A relay that is down for a few minutes must not cost a message: back off exponentially.
  attempts: env.WAYMARK_MAIL_ATTEMPTS,
  backoff: { type: 'exponential', delay: env.WAYMARK_MAIL_BACKOFF_MS },
  removeOnComplete: 200,
  removeOnFail: 500,
}))

/** The producer side of the mail queue, made on first use. */
export const mailQueue = producer.queue

/**
 * Enqueues an e-mail's job with the e-mail id as job id, so enqueueing twice (the request and
 * then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is already
 * committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueMail(emailId: string): Promise<void> {
  await producer.add(
    'send',
    { emailId },
    { jobId: emailId },
    { emailId },
    'e-mail not enqueued now; the sweeper will retry',
  )
}

export const closeMailQueue = producer.close

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
