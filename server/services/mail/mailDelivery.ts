import { Op } from 'sequelize'
import { logger } from '../../logger'
import { deliverMail, mailDomain } from '../../mail'
import { Email } from '../../models'
import { getFile } from '../../storage'

/**
 * Sends one queued e-mail and marks it `sent`. Safe to run twice: a row already sent (or one
 * the fake received) is left alone. The Message-ID is derived from the row id, so if a crash
 * between the relay's acceptance and our update makes the job send again, the receiving side
 * sees the same Message-ID and can drop the copy (our fake does).
 */
export async function sendEmail(id: string): Promise<void> {
  const email = await Email.findByPk(id)
  if (!email) throw new Error(`e-mail ${id} does not exist`)
  // A draft waits for a person to send it; a stray job for one sends nothing.
  if (email.status === 'sent' || email.status === 'received' || email.status === 'draft') return
  await email.increment('attempts')
  // The mail fake matches its copy to this row by Message-ID: fix it before the send.
  const messageId = email.messageId ?? `<${email.id}@${mailDomain()}>`
  if (!email.messageId) await email.update({ messageId })
  const attachments = []
  for (const a of email.attachments) {
    const file = await getFile(a.storageKey)
    attachments.push({ filename: a.filename, contentType: a.contentType, content: file.body })
  }
  try {
    const sent = await deliverMail({
      from: email.fromAddress,
      to: email.toAddresses,
      subject: email.subject,
      text: email.textBody,
      html: email.htmlBody ?? undefined,
      attachments,
      messageId,
    })
    await email.update({
      status: 'sent',
      messageId: sent.messageId,
      sentAt: new Date(),
      error: null,
    })
  } catch (err) {
    // Keep the latest reason on the row while the job retries, so the Outbox shows why.
    await email.update({ error: (err as Error).message })
    throw err
  }
}

/** Marks an e-mail `failed` after its last attempt, so it is never lost silently. */
export async function failEmail(id: string, message: string): Promise<void> {
  const [count] = await Email.update(
    { status: 'failed', error: message },
    { where: { id, status: 'queued' } },
  )
  if (count > 0) logger.error({ emailId: id, error: message }, 'e-mail given up')
}

/** Ids of e-mails still `queued` after `olderThanMs`: their job may have been lost. */
export async function pendingEmailIds(now: Date, olderThanMs: number): Promise<string[]> {
  const rows = await Email.findAll({
    where: { status: 'queued', updatedAt: { [Op.lt]: new Date(now.getTime() - olderThanMs) } },
    attributes: ['id'],
    order: [['updatedAt', 'ASC']],
    limit: 500,
  })
  return rows.map((r) => r.id)
}
