import { createServer } from 'node:net'
import type { Redis } from 'ioredis'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { EmailDto, OutboxPageDto } from '../../shared/schemas/outbox'
import { startSmtpFake } from '../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../server/mail'
import { db, Email, User } from '../../server/models'
import { closeMailQueue } from '../../server/services/mail/queue'
import { newQueueConnection } from '../../server/redis'
import { queueEmail } from '../../server/services/mail/outbox'
import type { Actor } from '../../server/services/audit'
import { startMailWorker } from '../../server/services/mail'
import { signedInAs, uniqueSuffix } from './support/client'

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

let fake: Awaited<ReturnType<typeof startSmtpFake>>
let connection: Redis
let mail: ReturnType<typeof startMailWorker>
let actor: Actor

async function waitForStatus(id: string, status: string): Promise<Email> {
  const deadline = Date.now() + 15_000
  for (;;) {
    const row = (await Email.findByPk(id))!
    if (row.status === status || Date.now() > deadline) return row
    await new Promise((r) => setTimeout(r, 100))
  }
}

async function closedPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  await new Promise((resolve) => server.close(resolve))
  return typeof address === 'object' && address ? address.port : 1
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
  fake = await startSmtpFake({ port: 0 })
  setSmtpPortForTests(fake.port)
  const admin = (await User.findOne({ where: { email: 'admin@ferncastle.example' } }))!
  actor = { id: admin.id, email: admin.email }
  connection = newQueueConnection()
  mail = startMailWorker(connection)
})

afterAll(async () => {
  mail.stop()
  await mail.worker.close()
  await closeMailQueue()
  await connection.quit()
  closeMail()
  await fake.close()
})

describe('mail', () => {
  it('sends a queued e-mail once, with its attachment, and the fake files it', async () => {
    const subject = `Lot certificate ${uniqueSuffix()}`
    const id = await queue(subject, true)
    const sent = await waitForStatus(id, 'sent')
    expect(sent.status).toBe('sent')
    expect(sent.attempts).toBe(1)
    expect(sent.messageId).toMatch(new RegExp(`^<${id}@`))
    expect(sent.sentAt).toBeInstanceOf(Date)

    const received = await Email.findAll({ where: { status: 'received', subject } })
    expect(received).toHaveLength(1)
    expect(received[0].toAddresses).toEqual(['quality@customer.example'])
    expect(received[0].messageId).toBe(sent.messageId)
    expect(received[0].attachments).toHaveLength(1)
    expect(received[0].attachments[0]).toMatchObject({
      filename: 'coc.pdf',
      contentType: 'application/pdf',
      size: PDF.length,
    })

    const admin = await signedInAs('admin')
    const page = (await admin.get('/api/outbox?status=received&pageSize=200').expect(200))
      .body as OutboxPageDto
    const row = page.rows.find((r) => r.subject === subject)
    expect(row?.attachmentCount).toBe(1)
    const one = (await admin.get(`/api/outbox/${row!.id}`).expect(200)).body as EmailDto
    expect(one.text).toContain('certificate of conformity')
    const file = await admin
      .get(`/api/outbox/${row!.id}/attachments/0`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (c: Buffer) => chunks.push(c))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
      .expect(200)
    expect(file.headers['content-type']).toMatch(/^application\/pdf/)
    expect(Buffer.compare(file.body as Buffer, PDF)).toBe(0)
    await admin.get(`/api/outbox/${row!.id}/attachments/1`).expect(404)
  })

  it('does not send an e-mail that is already sent', async () => {
    const subject = `Sent once ${uniqueSuffix()}`
    const id = await queue(subject, false)
    await waitForStatus(id, 'sent')
    const { sendEmail } = await import('../../server/services/mail/mailDelivery')
    await sendEmail(id)
    expect((await Email.findByPk(id))!.attempts).toBe(1)
    expect(await Email.count({ where: { status: 'received', subject } })).toBe(1)
  })

  it('marks an e-mail failed with the reason after its last attempt', async () => {
    setSmtpPortForTests(await closedPort())
    try {
      const id = await queue(`Undeliverable ${uniqueSuffix()}`, false)
      const failed = await waitForStatus(id, 'failed')
      expect(failed.status).toBe('failed')
      expect(failed.attempts).toBe(2)
      expect(failed.error).toMatch(/ECONNREFUSED|connect/i)
    } finally {
      setSmtpPortForTests(fake.port)
    }
  })

  it('shows the Outbox to admin and service only', async () => {
    await (await signedInAs('service')).get('/api/outbox').expect(200)
    await (await signedInAs('operator')).get('/api/outbox').expect(403)
    await (await signedInAs('admin')).get('/api/outbox?status=nope').expect(400)
  })
})
