import { describe, expect, it, vi } from 'vitest'
import { setSmtpPortForTests } from '../../../server/mail'
import { db, Email, User } from '../../../server/models'
import { queueEmail } from '../../../server/services/mail'
import { uniqueSuffix } from '../../api/support/client'
import { demoEmail, openPage, signInAs, useE2eApp } from '../support/setup'
import { closedPort, startMailRig } from '../../api/support/mailRig'

// One attempt per e-mail, so a message to a relay that is down fails at once instead of after
// the production back-off. Set before the server's settings are read, which imports do.
vi.hoisted(() => {
  process.env.WAYMARK_MAIL_ATTEMPTS = '1'
})

describe('Admin journey', () => {
  let rig: Awaited<ReturnType<typeof startMailRig>> | undefined

  // The relay starts down: the mail transport points at a port nothing listens on.
  const e2e = useE2eApp({
    before: async () => {
      rig = await startMailRig()
      setSmtpPortForTests(await closedPort())
    },
    after: async () => {
      await rig?.stop()
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
    setSmtpPortForTests(rig!.fake.port)
    await page.goto(`${e2e.app.baseUrl}/`)
    await page.waitForURL(/\/admin\/status$/)
    const mail = page.locator('.status__mail', { hasText: subject })
    await mail.getByRole('button', { name: 'Send again' }).click()
    await expect.poll(async () => (await Email.findByPk(queued.id))!.status).toBe('sent')
    await mail.waitFor({ state: 'detached' })
    await page.close()
  })
})
