import { env } from '../../env'
import type { Redis } from 'ioredis'
import { makeProducer, startRowWorker } from '../../queue'
import type { RowWorker } from '../../queue'
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

/** Enqueues again every e-mail left `queued` (its job was lost while Redis was down). */
export async function sweepMail(olderThanMs = 120_000): Promise<number> {
  const ids = await pendingEmailIds(new Date(), olderThanMs)
  for (const id of ids) await enqueueMail(id)
  return ids.length
}

/** Sends queued e-mails; the row records each attempt, the result and, at the end, any failure. */
export function startMailWorker(connection: Redis): RowWorker<MailJob> {
  return startRowWorker<MailJob>({
    queue: MAIL_QUEUE,
    connection,
    concurrency: 2,
    run: (job) => sendEmail(job.data.emailId),
    fail: (data, message) => failEmail(data.emailId, message),
    sweep: sweepMail,
    what: 'e-mail',
  })
}
