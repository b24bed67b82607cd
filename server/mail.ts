import { createTransport } from 'nodemailer'
import type { SendMailOptions, Transporter } from 'nodemailer'
import { env } from './env'

let transport: Transporter | undefined
let portForTests: number | undefined

/**
 * Points the local transport at another port (an in-process fake on a free port, or a closed
 * one to see delivery fail). Ignored when SMTP_URL is set.
 */
export function setSmtpPortForTests(port: number): void {
  portForTests = port
  closeMail()
}

function smtpPort(): number {
  const port = portForTests ?? env.WAYMARK_SMTP_PORT
  if (port === 0)
    throw new Error(
      'no SMTP server: set SMTP_URL or WAYMARK_SMTP_PORT, or start a fake in the test',
    )
  return port
}

/**
 * The nodemailer transport: the shop's relay from SMTP_URL, else the local fake on loopback.
 * The fake offers no STARTTLS, so the client must not try to upgrade.
 */
export function mailTransport(): Transporter {
  transport ??= env.SMTP_URL
    ? createTransport(env.SMTP_URL)
    : createTransport({ host: '127.0.0.1', port: smtpPort(), secure: false, ignoreTLS: true })
  return transport
}

/** The domain of MAIL_FROM, used to make Message-IDs that stay the same across retries. */
export function mailDomain(): string {
  return /@([^>\s]+)>?\s*$/.exec(env.MAIL_FROM)?.[1] ?? 'waymark.invalid'
}

/** Hands one message to the SMTP server; resolves with the Message-ID it went out under. */
export async function deliverMail(message: SendMailOptions): Promise<{ messageId: string }> {
  const info = (await mailTransport().sendMail(message)) as { messageId: string }
  return { messageId: info.messageId }
}

/** Closes the transport (it is made again on the next send). */
export function closeMail(): void {
  transport?.close()
  transport = undefined
}
