import type { EmailDto } from '../../../shared/schemas/outbox'
import { withTransaction } from '../../db/sql'
import { AppError } from '../../errors'
import { Email } from '../../models'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { getEmail } from './outbox'
import { enqueueMail, mailQueue } from './queue'

/**
 * Clears the finished job a failed e-mail left in the queue. Its job id is the e-mail id, so
 * while it is kept (the queue keeps the last 500 failures) a new job under that id would be
 * refused as a duplicate. Without Redis nothing can be sent, so that is a 503, before any change.
 */
async function clearOldJob(emailId: string): Promise<void> {
  try {
    const job = await Promise.race([
      mailQueue().getJob(emailId),
      new Promise<never>((_, reject) =>
        setTimeout(() => reject(new Error('redis did not answer')), 2000).unref(),
      ),
    ])
    if (job && (await job.isFailed())) await job.remove()
  } catch (err) {
    throw new AppError(
      503,
      'queue_unavailable',
      `the job queue does not answer (${(err as Error).message}); try again shortly`,
    )
  }
}

/**
 * Sends a failed e-mail again: it goes back to `queued` with its reason cleared, and a new job
 * with the full number of attempts is enqueued once that commits. Only a `failed` e-mail can be
 * retried (409 otherwise), so two admins pressing Retry at once send it once.
 */
export async function retryEmail(id: string, actor: Actor): Promise<EmailDto> {
  const found = await Email.findByPk(id)
  if (!found) throw AppError.notFound(`e-mail ${id}`)
  if (found.status === 'failed') await clearOldJob(id)
  await withTransaction(async (transaction) => {
    const email = await Email.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!email) throw AppError.notFound(`e-mail ${id}`)
    if (email.status !== 'failed')
      throw AppError.conflict(
        'email_not_failed',
        `this e-mail is ${email.status}: only a failed e-mail can be sent again`,
      )
    const reason = email.error
    await email.update({ status: 'queued', error: null }, { transaction })
    await recordAudit(
      actor,
      {
        action: 'email.retry',
        entity: 'email',
        entityId: id,
        before: { status: 'failed', error: reason, attempts: email.attempts },
        after: { status: 'queued' },
      },
      transaction,
    )
    transaction.afterCommit(() => void enqueueMail(id))
  })
  return getEmail(id)
}
