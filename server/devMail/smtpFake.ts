import type { Readable } from 'node:stream'
import { simpleParser } from 'mailparser'
import type { AddressObject, ParsedMail } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import type { SMTPServerSession } from 'smtp-server'
import { Op, UniqueConstraintError } from 'sequelize'
import type { EmailAttachmentRecord } from '../../shared/schemas/outbox'
import { logger } from '../logger'
import { db, Email } from '../models'
import { putFile } from '../storage'

const MAX_MESSAGE_BYTES = 25 * 1024 * 1024

function addressText(a: AddressObject | AddressObject[] | undefined): string | undefined {
  if (!a) return undefined
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ')
}

/**
 * A message the app itself sent (a row with its Message-ID that is not a copy) gets a delivery
 * receipt on that row instead of a row of its own. True when one did.
 */
async function fileReceipt(messageId: string | undefined): Promise<boolean> {
  if (!messageId) return false
  const [count] = await Email.update(
    { receiptAt: new Date() },
    { where: { messageId, status: { [Op.ne]: 'received' } } },
  )
  return count > 0
}

/**
 * Files one parsed message: a receipt on the row that sent it, else (mail the app did not send)
 * a `received` row; a Message-ID already filed is skipped.
 */
async function fileMessage(parsed: ParsedMail, session: SMTPServerSession): Promise<void> {
  if (await fileReceipt(parsed.messageId)) return
  const attachments: EmailAttachmentRecord[] = []
  for (const a of parsed.attachments) {
    const contentType = a.contentType || 'application/octet-stream'
    const stored = await putFile('mail', a.content, contentType)
    attachments.push({
      filename: a.filename ?? 'attachment',
      contentType,
      size: stored.size,
      storageKey: stored.key,
    })
  }
  // The envelope says who the relay would deliver to (Bcc included), not just the headers.
  const rcpt = session.envelope.rcptTo.map((r) => r.address)
  const mailFrom = session.envelope.mailFrom
  try {
    await Email.create({
      status: 'received',
      toAddresses: rcpt,
      fromAddress: addressText(parsed.from) ?? (mailFrom ? mailFrom.address : ''),
      subject: parsed.subject ?? '',
      textBody: parsed.text ?? '',
      htmlBody: parsed.html || null,
      attachments,
      messageId: parsed.messageId ?? null,
      error: null,
      relatedEntity: null,
      relatedId: null,
      createdBy: null,
      sentAt: parsed.date ?? null,
    })
  } catch (err) {
    // A sender that retried after we had filed the message: it is here once already.
    if (err instanceof UniqueConstraintError) return
    throw err
  }
}

/**
 * A local SMTP server that accepts every message and files it in the `emails` table (status
 * `received`, attachments in the object store), so development and tests send real mail
 * without reaching anybody. Loopback only, no TLS, no authentication required.
 */
export async function startSmtpFake(opts: { port: number; host?: string }): Promise<{
  port: number
  close: () => Promise<void>
}> {
  db()
  const server = new SMTPServer({
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    logger: false,
    banner: 'Waymark local mail fake; nothing leaves this machine',
    size: MAX_MESSAGE_BYTES,
    onData(stream: Readable, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          if ((stream as Readable & { sizeExceeded?: boolean }).sizeExceeded)
            throw Object.assign(new Error('message too large'), { responseCode: 552 })
          await fileMessage(parsed, session)
          callback()
        })
        .catch((err: Error & { responseCode?: number }) => {
          logger.error({ err }, 'smtp fake could not file a message')
          // 451: a temporary failure, so the sender keeps the message and retries.
          err.responseCode ??= 451
          callback(err)
        })
    },
  })
  server.on('error', (err) => logger.warn({ err }, 'smtp fake error'))
  const host = opts.host ?? '127.0.0.1'
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, host, () => {
      server.off('error', reject)
      resolve()
    })
  })
  const address = server.server.address()
  const port = typeof address === 'object' && address ? address.port : opts.port
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}
