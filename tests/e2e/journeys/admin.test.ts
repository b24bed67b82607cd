import { createServer } from 'node:net'
import type { Redis } from 'ioredis'
import { describe, expect, it, vi } from 'vitest'
import { startSmtpFake } from '../../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../../server/mail'
import { db, Email, User } from '../../../server/models'
import { newQueueConnection } from '../../../server/redis'
import { queueEmail, startMailWorker } from '../../../server/services/mail'
import { closeMailQueue } from '../../../server/services/mail/queue'
import { uniqueSuffix } from '../../api/support/client'
import { demoEmail, openPage, signInAs, useE2eApp } from '../support/setup'

// One attempt per e-mail, so a message to a relay that is down fails at once instead of after
// the production back-off. Set before the server's settings are read, which imports do.
vi.hoisted(() => {
  process.env.WAYMARK_MAIL_ATTEMPTS = '1'
})

/** A loopback port nothing listens on: the mail relay is down. */
async function closedPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  await new Promise((resolve) => server.close(resolve))
  return typeof address === 'object' && address ? address.port : 1
}

describe('Admin journey', () => {
  let connection: Redis
  let mail: ReturnType<typeof startMailWorker>
  let relay: Awaited<ReturnType<typeof startSmtpFake>>

  const e2e = useE2eApp({
    before: async () => {
      setSmtpPortForTests(await closedPort())
      relay = await startSmtpFake({ port: 0 })
      connection = newQueueConnection()
      mail = startMailWorker(connection)
    },
    after: async () => {
      mail?.stop()
      await mail?.worker.close()
      await closeMailQueue()
      await connection?.quit()
      await relay?.close()
      closeMail()
    },
  })

  it('finds an e-mail the relay refused, reads why in the Outbox, and sends it again from the status page', async () => {
    // Set-up: a certificate e-mail a colleague queued while the relay was down.
    const subject = `Certificate of conformance ${uniqueSuffix()}`
    const service = (await User.findOne({ where: { email: demoEmail('service') } }))!
    const queued = await db().transaction((transaction) =>
      queueEmail(
        { to: ['quality@customer.example'], subject, text: 'The certificate is attached.' },
        { id: service.id, email: service.email },
        transaction,
      ),
    )
    await expect.poll(async () => (await Email.findByPk(queued.id))!.status).toBe('failed')

    const page = await openPage(e2e, 'journey-admin')
    await signInAs(e2e, page, 'admin', '/outbox')
    await page.waitForURL(/\/outbox$/)
    await page.locator('.el-select', { hasText: 'Any status' }).click()
    await page.getByRole('option', { name: /^Failed$/i }).click()
    const row = page.locator('.el-table__row', { hasText: subject })
    await row.click()
    const problem = page.getByRole('alert').filter({ hasText: 'Not delivered after 1 attempt' })
    await problem.waitFor()
    expect(await problem.textContent()).toMatch(/ECONNREFUSED|connect/i)

    // The relay is back: the admin's home, the status page, offers the message again.
    setSmtpPortForTests(relay.port)
    await page.goto(`${e2e.app.baseUrl}/`)
    await page.waitForURL(/\/admin\/status$/)
    const mail = page.locator('.status__mail', { hasText: subject })
    await mail.getByRole('button', { name: 'Send again' }).click()
    await expect.poll(async () => (await Email.findByPk(queued.id))!.status).toBe('sent')
    await mail.waitFor({ state: 'detached' })
    await page.close()
  })
})
