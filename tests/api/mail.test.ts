import { createTransport } from 'nodemailer'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { EmailDto, OutboxPageDto } from '../../shared/schemas/outbox'
import { setSmtpPortForTests } from '../../server/mail'
import { db, Email, User } from '../../server/models'
import { queueEmail } from '../../server/services/mail/outbox'
import type { Actor } from '../../server/services/audit'
import { signedInAs, uniqueSuffix } from './support/client'
import { closedPort, startMailRig, waitForEmailStatus } from './support/mailRig'

// Two quick attempts, so the failure case ends in well under a second instead of minutes.
vi.hoisted(() => {
  process.env.WAYMARK_MAIL_ATTEMPTS = '2'
  process.env.WAYMARK_MAIL_BACKOFF_MS = '100'
})

// The smallest PDF readers accept: enough to check the bytes arrive unchanged.
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n' +
    '2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)

let rig: Awaited<ReturnType<typeof startMailRig>>
let actor: Actor

/** The first truthy answer of `read`, polled until a deadline (then its last answer). */
async function waitFor<T>(read: () => Promise<T>): Promise<T> {
  const deadline = Date.now() + 15_000
  for (;;) {
    const value = await read()
    if (value || Date.now() > deadline) return value
    await new Promise((r) => setTimeout(r, 100))
  }
}

async function queue(subject: string, withPdf: boolean): Promise<string> {
  return db().transaction(async (transaction) => {
    const email = await queueEmail(
      {
        to: ['quality@customer.example'],
        subject,
        text: 'The certificate of conformity is attached.',
        attachments: withPdf
          ? [{ filename: 'coc.pdf', contentType: 'application/pdf', content: PDF }]
          : [],
      },
      actor,
      transaction,
    )
    return email.id
  })
}

beforeAll(async () => {
  rig = await startMailRig()
  const admin = (await User.findOne({ where: { email: 'admin@ferncastle.example' } }))!
  actor = { id: admin.id, email: admin.email }
})

afterAll(() => rig.stop())

describe('mail', () => {
  it('sends a queued e-mail once, and the Outbox shows it once with its delivery receipt', async () => {
    const subject = `Lot certificate ${uniqueSuffix()}`
    const id = await queue(subject, true)
    // The Message-ID is fixed when the row is written, before any send.
    expect((await Email.findByPk(id))!.messageId).toMatch(new RegExp(`^<${id}@`))
    const sent = await waitForEmailStatus(id, 'sent')
    expect(sent.status).toBe('sent')
    expect(sent.attempts).toBe(1)
    expect(sent.messageId).toMatch(new RegExp(`^<${id}@`))
    expect(sent.sentAt).toBeInstanceOf(Date)

    // The fake matched its copy to the sent row by Message-ID: a receipt, not a row of its own.
    const receipted = await waitFor(async () => (await Email.findByPk(id))!.receiptAt)
    expect(receipted).toBeInstanceOf(Date)
    expect(await Email.count({ where: { status: 'received', subject } })).toBe(0)

    const admin = await signedInAs('admin')
    const page = (await admin.get('/api/outbox?pageSize=200').expect(200)).body as OutboxPageDto
    const rows = page.rows.filter((r) => r.subject === subject)
    expect(rows).toHaveLength(1)
    expect(rows[0]).toMatchObject({ id, status: 'sent', attachmentCount: 1 })
    expect(rows[0]!.receiptAt).not.toBeNull()
    const one = (await admin.get(`/api/outbox/${id}`).expect(200)).body as EmailDto
    expect(one.text).toContain('certificate of conformity')
    const file = await admin
      .get(`/api/outbox/${id}/attachments/0`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (c: Buffer) => chunks.push(c))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
      .expect(200)
    expect(file.headers['content-type']).toMatch(/^application\/pdf/)
    expect(Buffer.compare(file.body as Buffer, PDF)).toBe(0)
    await admin.get(`/api/outbox/${id}/attachments/1`).expect(404)
  })

  it('files mail the app did not send as a received row of its own', async () => {
    const subject = `From outside ${uniqueSuffix()}`
    const messageId = `<outside-${uniqueSuffix()}@elsewhere.example>`
    const transport = createTransport({
      host: '127.0.0.1',
      port: rig.fake.port,
      secure: false,
      ignoreTLS: true,
    })
    try {
      await transport.sendMail({
        from: 'someone@elsewhere.example',
        to: 'lead@ferncastle.example',
        subject,
        text: 'Not from Waymark.',
        messageId,
      })
    } finally {
      transport.close()
    }
    const rows = await Email.findAll({ where: { subject } })
    expect(rows.map((r) => [r.status, r.messageId])).toEqual([['received', messageId]])
    const admin = await signedInAs('admin')
    const page = (await admin.get('/api/outbox?status=received&pageSize=200').expect(200))
      .body as OutboxPageDto
    expect(page.rows.filter((r) => r.subject === subject)).toHaveLength(1)
  })

  it('hides a copy filed before receipts existed behind the row that sent it', async () => {
    const subject = `Filed twice ${uniqueSuffix()}`
    const id = await queue(subject, false)
    const sent = await waitForEmailStatus(id, 'sent')
    // A copy as the fake filed it before it matched Message-IDs.
    await Email.create({
      status: 'received',
      toAddresses: sent.toAddresses,
      fromAddress: sent.fromAddress,
      subject,
      textBody: sent.textBody,
      htmlBody: null,
      messageId: sent.messageId,
      error: null,
      relatedEntity: null,
      relatedId: null,
      createdBy: null,
      sentAt: sent.sentAt,
    })
    const admin = await signedInAs('admin')
    const page = (await admin.get('/api/outbox?pageSize=200').expect(200)).body as OutboxPageDto
    expect(page.rows.filter((r) => r.subject === subject).map((r) => r.id)).toEqual([id])
  })

  it('does not send an e-mail that is already sent', async () => {
    const subject = `Sent once ${uniqueSuffix()}`
    const id = await queue(subject, false)
    await waitForEmailStatus(id, 'sent')
    const { sendEmail } = await import('../../server/services/mail/mailDelivery')
    await sendEmail(id)
    expect((await Email.findByPk(id))!.attempts).toBe(1)
    expect(await waitFor(async () => (await Email.findByPk(id))!.receiptAt)).toBeInstanceOf(Date)
    expect(await Email.count({ where: { status: 'received', subject } })).toBe(0)
  })

  it('marks an e-mail failed with the reason after its last attempt', async () => {
    setSmtpPortForTests(await closedPort())
    try {
      const id = await queue(`Undeliverable ${uniqueSuffix()}`, false)
      const failed = await waitForEmailStatus(id, 'failed')
      expect(failed.status).toBe('failed')
      expect(failed.attempts).toBe(2)
      expect(failed.error).toMatch(/ECONNREFUSED|connect/i)
    } finally {
      setSmtpPortForTests(rig.fake.port)
    }
  })

  it('shows the Outbox to admin and service only', async () => {
    await (await signedInAs('service')).get('/api/outbox').expect(200)
    await (await signedInAs('operator')).get('/api/outbox').expect(403)
    await (await signedInAs('admin')).get('/api/outbox?status=nope').expect(400)
  })
})
