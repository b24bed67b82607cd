import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import type { Transaction, WhereOptions } from 'sequelize'
import type {
  EmailAttachmentRecord,
  EmailDto,
  EmailSummaryDto,
  OutboxPageDto,
  OutboxQuery,
} from '../../../shared/schemas/outbox'
import { env } from '../../env'
import { mailDomain } from '../../mail'
import { AppError } from '../../errors'
import { db, Email } from '../../models'
import { enqueueMail } from './queue'
import { putFile } from '../../storage'
import { auditAction, changedFields } from '../admin'
import type { Actor } from '../admin'
import { pickFields } from '../presenters'
import { withTransaction } from '../../db/sql'

/** An attachment to send: new bytes, or a file already in the object store (a document). */
export type OutgoingAttachment =
  | { filename: string; contentType: string; content: Buffer }
  | { filename: string; contentType: string; storageKey: string; size: number }

export interface OutgoingEmail {
  to: string | string[]
  subject: string
  text: string
  html?: string
  attachments?: OutgoingAttachment[]
  /** The record the message is about, e.g. `{ entity: 'lot', id }`. */
  related?: { entity: string; id: string }
}

function toSummaryDto(e: Email): EmailSummaryDto {
  return {
    ...pickFields(e, ['id', 'direction', 'status', 'subject', 'attempts', 'error']),
    to: e.toAddresses,
    from: e.fromAddress,
    attachmentCount: e.attachments.length,
    related: e.relatedEntity && e.relatedId ? { entity: e.relatedEntity, id: e.relatedId } : null,
    createdAt: e.createdAt.toISOString(),
    sentAt: e.sentAt?.toISOString() ?? null,
    receiptAt: e.receiptAt?.toISOString() ?? null,
  }
}

/**
 * A new e-mail row's id and Message-ID, fixed before it is sent: the mail fake matches its copy
 * to the row by it, and a retried send goes out under the same one.
 */
function newIdentity(): { id: string; messageId: string } {
  const id = randomUUID()
  return { id, messageId: `<${id}@${mailDomain()}>` }
}

function toEmailDto(e: Email): EmailDto {
  return {
    ...toSummaryDto(e),
    text: e.textBody,
    html: e.htmlBody,
    messageId: e.messageId,
    attachments: e.attachments.map(({ filename, contentType, size }) => ({
      filename,
      contentType,
      size,
    })),
  }
}

/** Puts new attachment bytes in the object store; content addressing makes a retry harmless. */
async function storeAttachments(list: OutgoingAttachment[]): Promise<EmailAttachmentRecord[]> {
  const out: EmailAttachmentRecord[] = []
  for (const a of list) {
    if ('storageKey' in a) {
      out.push({
        filename: a.filename,
        contentType: a.contentType,
        size: a.size,
        storageKey: a.storageKey,
      })
      continue
    }
    const stored = await putFile('mail', a.content, a.contentType)
    out.push({
      filename: a.filename,
      contentType: a.contentType,
      size: stored.size,
      storageKey: stored.key,
    })
  }
  return out
}

/**
 * Writes a `queued` e-mail row in the caller's transaction and enqueues its job once that
 * transaction commits: a change that rolls back sends nothing, and the worker never looks
 * for a row that is not there yet.
 */
export async function queueEmail(
  mail: OutgoingEmail,
  actor: Actor,
  transaction: Transaction,
  /** When it was queued, if not now: the demo seed's clock. */
  at?: Date,
): Promise<EmailDto> {
  const to = Array.isArray(mail.to) ? mail.to : [mail.to]
  if (to.length === 0) throw AppError.badRequest('an e-mail needs at least one recipient')
  const attachments = await storeAttachments(mail.attachments ?? [])
  const email = await Email.create(
    {
      ...newIdentity(),
      toAddresses: to,
      fromAddress: env.MAIL_FROM,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html ?? null,
      attachments,
      error: null,
      relatedEntity: mail.related?.entity ?? null,
      relatedId: mail.related?.id ?? null,
      createdBy: actor.id,
      sentAt: null,
      ...(at ? { createdAt: at } : {}),
    },
    { transaction },
  )
  await auditAction(
    actor,
    'email.queue',
    email.id,
    {
      after: {
        to,
        subject: mail.subject,
        attachments: attachments.map((a) => a.filename),
        related: mail.related ?? null,
      },
      at,
    },
    transaction,
  )
  transaction.afterCommit(() => void enqueueMail(email.id))
  return toEmailDto(email)
}

/**
 * A copy the mail fake filed of a message the app sent (before copies became receipts on the
 * sent row): the sent row stands for it, so the list leaves it out.
 */
const SENT_COPY = `"Email"."status" = 'received' AND EXISTS (SELECT 1 FROM emails o
  WHERE o.message_id = "Email"."message_id" AND o.status <> 'received')`

/**
 * A page of the Outbox, newest first, optionally of one status: each message once, a sent one
 * with its delivery receipt, and as `received` only mail the app did not send.
 */
export async function listEmails(q: OutboxQuery): Promise<OutboxPageDto> {
  const where: WhereOptions<Email> = {
    ...(q.status ? { status: q.status } : {}),
    [Op.and]: [db().literal(`NOT (${SENT_COPY})`)],
  }
  const { rows, count } = await Email.findAndCountAll({
    where,
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return { total: count, rows: rows.map(toSummaryDto) }
}

/** One e-mail with bodies and attachment list. */
export async function getEmail(id: string): Promise<EmailDto> {
  const email = await Email.findByPk(id)
  if (!email) throw AppError.notFound(`e-mail ${id}`)
  return toEmailDto(email)
}

/** Where the `index`-th attachment of an e-mail is stored. */
export async function emailAttachment(id: string, index: number): Promise<EmailAttachmentRecord> {
  const email = await Email.findByPk(id)
  if (!email) throw AppError.notFound(`e-mail ${id}`)
  const attachment = email.attachments[index]
  if (!attachment) throw AppError.notFound(`attachment ${index} of e-mail ${id}`)
  return attachment
}

/**
 * Writes a `draft` e-mail in the caller's transaction: prepared for a person to review, never
 * sent until someone sends it (`sendDraft`). No attachments, no job.
 */
export async function draftEmail(
  mail: Omit<OutgoingEmail, 'attachments' | 'html'>,
  actor: Actor,
  transaction: Transaction,
): Promise<EmailDto> {
  const to = Array.isArray(mail.to) ? mail.to : [mail.to]
  if (to.length === 0) throw AppError.badRequest('an e-mail needs at least one recipient')
  const email = await Email.create(
    {
      ...newIdentity(),
      status: 'draft',
      toAddresses: to,
      fromAddress: env.MAIL_FROM,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: null,
      error: null,
      relatedEntity: mail.related?.entity ?? null,
      relatedId: mail.related?.id ?? null,
      createdBy: actor.id,
      sentAt: null,
    },
    { transaction },
  )
  await auditAction(
    actor,
    'email.draft',
    email.id,
    {
      after: { to, subject: mail.subject, related: mail.related ?? null },
    },
    transaction,
  )
  return toEmailDto(email)
}

async function lockDraft(id: string, transaction: Transaction): Promise<Email> {
  const email = await Email.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!email) throw AppError.notFound(`e-mail ${id}`)
  if (email.status !== 'draft')
    throw AppError.conflict(
      'email_not_draft',
      `this e-mail is ${email.status}, not a draft: only drafts can be edited or sent from here`,
    )
  return email
}

/** Edits the subject or text of a draft before it is sent. */
export async function updateDraft(
  id: string,
  input: { subject?: string; text?: string },
  actor: Actor,
): Promise<EmailDto> {
  return withTransaction(async (transaction) => {
    const email = await lockDraft(id, transaction)
    const before = { subject: email.subject, text: email.textBody }
    await email.update(
      { subject: input.subject ?? email.subject, textBody: input.text ?? email.textBody },
      { transaction },
    )
    await auditAction(
      actor,
      'email.edit_draft',
      id,
      {
        ...changedFields(before, { subject: email.subject, text: email.textBody }),
      },
      transaction,
    )
    return toEmailDto(email)
  })
}

/** Sends a reviewed draft: it becomes `queued` and its job is enqueued once that commits. */
export async function sendDraft(id: string, actor: Actor): Promise<EmailDto> {
  return withTransaction(async (transaction) => {
    const email = await lockDraft(id, transaction)
    await email.update({ status: 'queued' }, { transaction })
    await auditAction(
      actor,
      'email.send_draft',
      id,
      {
        before: { status: 'draft' },
        after: { status: 'queued', to: email.toAddresses, subject: email.subject },
      },
      transaction,
    )
    transaction.afterCommit(() => void enqueueMail(email.id))
    return toEmailDto(email)
  })
}
