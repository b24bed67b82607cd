import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { OutboxPageDto } from '../../../shared/schemas/outbox'
import type { ShipmentDto, ShipmentSummaryDto } from '../../../shared/schemas/shipping'
import type { UnitTraceDto } from '../../../shared/schemas/trace'
import { callApi, openPage, signInAs, useE2eApp } from '../support/setup'
import { withMailWorkers } from '../support/mailWorkers'

/**
 * A shipped unit no service case has taken back yet, from the newest shipment with a customer
 * contact; the last serial of it, so other tests that take the first one of a shipment differ.
 */
async function shippedUnit(page: Page): Promise<{ serial: string; contact: string }> {
  for (const summary of await callApi<ShipmentSummaryDto[]>(page, '/shipments')) {
    const shipment = await callApi<ShipmentDto>(page, `/shipments/${summary.id}`)
    const unit = shipment.units.filter((u) => u.state === 'shipped').at(-1)
    if (unit && shipment.customerEmail)
      return { serial: unit.serial, contact: shipment.customerEmail }
  }
  throw new Error('the demo has no shipped unit left')
}

describe('Service journey', () => {
  const e2e = useE2eApp(withMailWorkers())

  it('traces a shipped serial, e-mails its certificate and logs the customer’s return', async () => {
    const page = await openPage(e2e, 'journey-service')
    await signInAs(e2e, page, 'service', '/trace')
    const { serial, contact } = await shippedUnit(page)

    // Trace: the serial typed as a scanner types it.
    await page.waitForURL(/\/trace$/)
    await page.waitForFunction(
      () => document.activeElement?.getAttribute('data-field') === 'trace-scan',
    )
    await page.keyboard.type(serial)
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)
    await page.getByText('History, step by step').waitFor()

    // The certificate, made by the documents worker, e-mailed to the customer's contact.
    await page.getByRole('button', { name: `Make certificate for ${serial}` }).click()
    // The unit's own new certificate, not an older paper of its shipment in the same list.
    const emailButton = page
      .locator('[data-kind=certificate]', { hasText: `${serial}-certificate.pdf` })
      .getByRole('button', { name: 'E-mail to customer' })
    await emailButton.click()
    const dialog = page.getByRole('dialog')
    await expect
      .poll(() => dialog.locator('input, textarea').first().inputValue())
      .toContain(contact.toLowerCase().split('@')[1]!)
    await dialog.getByRole('button', { name: 'Queue e-mail' }).click()
    await page.getByText('E-mail queued').waitFor()
    await expect
      .poll(async () => {
        const sent = await callApi<OutboxPageDto>(page, '/outbox?status=sent&pageSize=50')
        return sent.rows.some((e) => e.subject.includes(serial))
      })
      .toBe(true)

    // The customer sends it back: service logs the return against the serial.
    await page.goto(`${e2e.app.baseUrl}/service`)
    await page.getByRole('button', { name: 'Log a return' }).click()
    const form = page.getByRole('dialog', { name: 'Log a return' })
    await form.getByLabel("Serial (scan the unit's label)").fill(serial)
    await form.getByLabel('What the customer reports').fill('No output after a week in service')
    await form.getByRole('button', { name: 'Log return' }).click()
    await form.waitFor({ state: 'hidden' })
    const drawer = page.locator('.el-drawer:not(.shell-menu)')
    await expect.poll(() => drawer.locator('.svc-serial').textContent()).toBe(serial)

    const trace = await callApi<UnitTraceDto>(page, `/trace/units/${serial}`)
    expect(trace.unit.state).toBe('returned')
    expect(trace.serviceCases.length).toBeGreaterThan(0)
    await page.close()
  })
})
