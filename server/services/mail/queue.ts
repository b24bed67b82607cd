import { env } from '../../env'
import { makeProducer } from '../../queue'

/** The queue the mail worker (workers/mail.ts) takes e-mails to send from. */
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
