import { Queue } from 'bullmq'
import { env } from '../env'
import { logger } from '../logger'
import { newQueueConnection, redisPrefix } from '../redis'

/** The queue the mail worker (workers/mail.ts) takes e-mails to send from. */
export const MAIL_QUEUE = 'mail'

export interface MailJob {
  emailId: string
}

let queue: Queue<MailJob> | undefined
let connection: ReturnType<typeof newQueueConnection> | undefined

/** The producer side of the mail queue, made on first use. */
export function mailQueue(): Queue<MailJob> {
  connection ??= newQueueConnection()
  queue ??= new Queue<MailJob>(MAIL_QUEUE, {
    connection,
    prefix: redisPrefix,
    defaultJobOptions: {
      // A relay that is down for a few minutes must not cost a message: back off exponentially.
      attempts: env.WAYMARK_MAIL_ATTEMPTS,
      backoff: { type: 'exponential', delay: env.WAYMARK_MAIL_BACKOFF_MS },
      removeOnComplete: 200,
      removeOnFail: 500,
    },
  })
  return queue
}

/**
 * Enqueues an e-mail's job with the e-mail id as job id, so enqueueing twice (the request and
 * then the sweeper) leaves one job. A Redis outage is logged, not thrown: the row is already
 * committed as `queued` and the sweeper enqueues it once Redis is back.
 */
export async function enqueueMail(emailId: string): Promise<void> {
  try {
    await Promise.race([
      mailQueue().add('send', { emailId }, { jobId: emailId }),
      new Promise((_, reject) =>
        setTimeout(() => reject(new Error('redis did not answer in 2 s')), 2000).unref(),
      ),
    ])
  } catch (err) {
    logger.warn({ err, emailId }, 'e-mail not enqueued now; the sweeper will retry')
  }
}

/** Closes the producer and its connection (BullMQ leaves a connection it was given open). */
export async function closeMailQueue(): Promise<void> {
  await queue?.close()
  await connection?.quit().catch(() => connection?.disconnect())
  queue = undefined
  connection = undefined
}
