import { Op, QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { db, Email } from '../../server/models'
import {
  DEMO_PASSWORD,
  demoEmail,
  openPage,
  picturesOf,
  useE2eApp,
  waitForStillness,
} from './support/setup'
import { withMailWorkers } from './support/mailWorkers'

/** A unit of the demo shipment, and the contact e-mail of the customer it went to. */
async function shippedSerial(): Promise<{ serial: string; contact: string }> {
  const [row] = await db().query<{ serial: string; contact: string }>(
    `SELECT u.serial, c.contact_email AS contact
       FROM units u
       JOIN shipment_units su ON su.unit_id = u.id
       JOIN shipments s ON s.id = su.shipment_id
       JOIN customers c ON c.id = s.customer_id
      WHERE u.state = 'shipped' AND c.contact_email <> ''
      ORDER BY u.serial LIMIT 1`,
    { type: QueryTypes.SELECT },
  )
  if (!row) throw new Error('the demo seed has no shipped unit')
  return row
}

describe('Customer service e-mails a certificate from a trace', () => {
  const e2e = useE2eApp(withMailWorkers())

  it('scans a shipped serial, opens its history, e-mails a certificate and finds it in the Outbox', async () => {
    const { serial, contact } = await shippedSerial()
    const page = await openPage(e2e, 'service-certificate')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await page.getByLabel('E-mail').fill(demoEmail('service'))
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.keyboard.press('Enter')
    await page.waitForURL((u) => u.pathname !== '/signin')

    // The keyboard alone, as a hand scanner types: the scan box has the focus on arrival.
    await page.goto(`${e2e.app.baseUrl}/trace`)
    await page.waitForFunction(
      () => document.activeElement?.getAttribute('data-field') === 'trace-scan',
    )
    await page.keyboard.type(serial)
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)
    expect(await page.getByText('History, step by step').isVisible()).toBe(true)

    const sentBefore = await Email.count({ where: { receiptAt: { [Op.ne]: null } } })
    await page.getByRole('button', { name: `Make certificate for ${serial}` }).click()
    // The documents worker makes it; the list polls until it is ready to send.
    // The unit's own new certificate, not an older paper of its shipment in the same list.
    const emailButton = page
      .locator('[data-kind=certificate]', { hasText: `${serial}-certificate.pdf` })
      .getByRole('button', { name: 'E-mail to customer' })
    await emailButton.waitFor()
    await emailButton.click()
    const dialog = page.getByRole('dialog')
    await dialog.getByRole('button', { name: 'Queue e-mail' }).waitFor()
    // The dialog starts from the customer's contact e-mail.
    await expect
      .poll(() => dialog.locator('input, textarea').first().inputValue())
      .toContain(contact.toLowerCase().split('@')[1]!)
    await waitForStillness(page)
    await picturesOf(page)('service-certificate-email')
    await dialog.getByRole('button', { name: 'Queue e-mail' }).click()
    await page.getByText('E-mail queued').waitFor()

    // The fake SMTP server filed the message: a delivery receipt on the sent row, which
    // carries the certificate.
    await expect
      .poll(() => Email.count({ where: { receiptAt: { [Op.ne]: null } } }))
      .toBeGreaterThan(sentBefore)
    const received = await Email.findOne({
      where: { receiptAt: { [Op.ne]: null } },
      order: [['receiptAt', 'DESC']],
    })
    expect(received!.subject).toContain(serial)
    expect(received!.attachments.map((a) => a.contentType)).toContain('application/pdf')

    await page.goto(`${e2e.app.baseUrl}/outbox`)
    await page.getByText(received!.subject).first().waitFor()
    await picturesOf(page)('service-certificate-outbox')
  })
})
