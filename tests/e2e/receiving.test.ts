import { describe, expect, it } from 'vitest'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import type { PartDto } from '../../shared/schemas/recipes'
import { Email } from '../../server/models'
import {
  callApi,
  openPage,
  picturesOf,
  signInAs,
  useE2eApp,
  waitForStillness,
} from './support/setup'

// The smallest valid PDF, built here so the test needs no fixture on disk.
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
)
const suffix = () => Math.random().toString(36).slice(2, 7).toUpperCase()

/** The day `days` after `iso` (YYYY-MM-DD), in calendar days. */
function addDays(iso: string, days: number): string {
  const d = new Date(`${iso}T00:00:00Z`)
  d.setUTCDate(d.getUTCDate() + days)
  return d.toISOString().slice(0, 10)
}

describe('Receiving: suppliers, expiry and incoming inspection', () => {
  const e2e = useE2eApp()

  it('receives a lot of an ageing part that needs inspection, then accepts it', async () => {
    const page = await openPage(e2e, 'receiving-inspection')
    await signInAs(e2e, page, 'stores', '/receiving')
    await page.getByRole('heading', { name: 'Receiving' }).waitFor()
    // Set-up through the API: a part that ages (90 days) and needs incoming inspection.
    const part = await callApi<PartDto>(page, '/parts', 'POST', {
      partNumber: `E2E-PASTE-${suffix()}`,
      description: 'Solder paste, e2e',
      unitOfMeasure: 'g',
      hasExpiry: true,
      shelfLifeDays: 90,
      needsInspection: true,
    })
    // The demo shop already has this supplier; goods-in types it in another case.
    const known = 'Northway Components'
    const supplierLotCode = `NW-${suffix()}`

    await page.getByRole('button', { name: 'Receive a lot' }).click()
    const dialog = page.getByRole('dialog', { name: 'Receive a component lot' })
    await dialog.locator('.el-select').first().click()
    await page.keyboard.type(part.partNumber)
    await page.getByRole('option', { name: new RegExp(part.partNumber) }).click()

    // The expiry date is asked for, filled from the shelf life, and says where it came from.
    const receivedOn = await dialog.locator('.lot-form__date input').first().inputValue()
    const expected = addDays(receivedOn, 90)
    await expect
      .poll(() => dialog.locator('input[placeholder="from the label"]').inputValue())
      .toBe(expected)
    await dialog.getByText(`90 days' shelf life suggests ${expected}`).waitFor()
    await dialog.getByText('This part needs incoming inspection').waitFor()

    const supplier = dialog.getByLabel('Supplier', { exact: true })
    await supplier.fill('northway comp')
    const suggestion = page.locator('.el-autocomplete-suggestion li', { hasText: known })
    await suggestion.waitFor()
    await suggestion.click()
    await dialog.locator('[data-test="supplier-known"]', { hasText: known }).waitFor()
    await dialog.getByLabel("Supplier's lot code").fill(supplierLotCode)
    await dialog.locator('.lot-form__qty input').fill('500')
    await waitForStillness(page)
    await picturesOf(page)('receiving-form')
    await dialog.getByRole('button', { name: 'Receive lot' }).click()
    await dialog.waitFor({ state: 'hidden' })

    // The new lot waits for inspection, under the supplier's record.
    const row = page.locator('.el-table__row', { hasText: supplierLotCode })
    await row.waitFor()
    expect(await row.textContent()).toContain(known)
    const status = row.locator('[data-test="inspect"]')
    expect(await status.textContent()).toContain('Awaiting inspection')
    await waitForStillness(page)
    await picturesOf(page)('receiving-awaiting')
    await status.click()
    const inspection = page.getByRole('dialog', { name: /Incoming inspection of lot/ })
    await inspection.waitFor()
    const accept = inspection.getByRole('button', { name: 'Accept lot' })
    expect(await accept.isDisabled()).toBe(true)
    await inspection.locator('input[type="file"]').setInputFiles({
      name: 'coc.pdf',
      mimeType: 'application/pdf',
      buffer: PDF,
    })
    await inspection.getByRole('link', { name: 'coc.pdf' }).waitFor()
    await inspection.getByLabel('Note: what was checked').fill('Certificate matches; viscosity ok')
    await waitForStillness(page)
    await picturesOf(page)('receiving-inspection')
    await accept.click()
    await page.locator('.el-message--success', { hasText: 'accepted' }).waitFor()
    await expect.poll(() => row.locator('.lot-status').textContent()).toContain('Available')

    const lots = await callApi<{ rows: ComponentLotDto[] }>(
      page,
      `/component-lots?q=${supplierLotCode}`,
    )
    expect(lots.rows).toHaveLength(1)
    expect(lots.rows[0]).toMatchObject({
      supplierName: known,
      expiresOn: expected,
      status: 'available',
      awaitsInspection: false,
      inspectionNote: 'Certificate matches; viscosity ok',
    })
    await page.close()
  })

  it('gives the Outbox subject the room to be read', async () => {
    // Test set-up only: a queued message with a long subject, as alerts and letters have.
    const subject = `Yield alert ${suffix()}: lot L-0042 step Load test below 90 % first-pass yield after 12 units, 3 failed on output ripple`
    await Email.create({
      toAddresses: [
        'lead@ferncastle.example',
        'quality.manager@customer-with-a-long-domain.example',
      ],
      fromAddress: 'waymark@ferncastle.example',
      subject,
      textBody: 'e2e',
      htmlBody: null,
      messageId: null,
      error: null,
      relatedEntity: null,
      relatedId: null,
      createdBy: null,
      sentAt: null,
    })
    const page = await openPage(e2e, 'outbox-subject')
    // The context still holds the stores session of the test above.
    await page.context().clearCookies()
    await signInAs(e2e, page, 'admin', '/outbox')
    const cell = page.locator('.outbox__subject', { hasText: subject.slice(0, 30) })
    await cell.waitFor()
    const box = await cell.evaluate((el) => ({
      width: el.getBoundingClientRect().width,
      lines: Math.round(
        el.getBoundingClientRect().height / parseFloat(getComputedStyle(el).lineHeight),
      ),
      isClippedSideways: el.scrollWidth > el.clientWidth + 1,
      title: el.getAttribute('title'),
    }))
    // Wide enough for most subjects on one line at 1280 px, wrapping to two, never cut sideways.
    expect(box.width).toBeGreaterThanOrEqual(360)
    expect(box.lines).toBe(2)
    expect(box.isClippedSideways).toBe(false)
    expect(box.title).toBe(subject)
    await waitForStillness(page)
    await picturesOf(page)('outbox-subject')
    await cell.click()
    await page.locator('.mail__subject', { hasText: subject }).waitFor()
    await page.close()
  })
})
