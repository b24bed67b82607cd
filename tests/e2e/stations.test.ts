import { randomBytes } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { openPage, picturesOf, signInHere, useE2eApp, waitForStillness } from './support/setup'

describe('Stations screen', () => {
  const e2e = useE2eApp()

  it('lets an admin add a station through the form and shows it in the table', async () => {
    const code = `E2E-${randomBytes(2).toString('hex').toUpperCase()}`
    const page = await openPage(e2e, 'stations-add')

    // A deep link while signed out goes to sign-in and comes back afterwards.
    await page.goto(`${e2e.app.baseUrl}/admin/stations`)
    await page.waitForURL(/\/signin\?next=/)
    await signInHere(page, 'admin')
    await page.waitForURL(/\/admin\/stations$/)
    await page.getByRole('heading', { name: 'Stations' }).waitFor()

    await page.getByRole('button', { name: 'New station' }).click()
    const dialog = page.getByRole('dialog', { name: 'New station' })
    await dialog.getByLabel('Code').fill(code)
    await dialog.getByLabel('Name').fill('End-to-end test bench')
    await dialog.locator('.el-select').click()
    await page.getByRole('option', { name: 'Hipot', exact: true }).click()
    await dialog.getByRole('button', { name: 'Add station' }).click()

    await page.locator('.el-message--success', { hasText: code }).waitFor()
    const row = page.locator('.el-table__row', { hasText: code })
    await row.waitFor()
    expect(await row.textContent()).toContain('End-to-end test bench')
    expect(await row.textContent()).toContain('Hipot')

    // Let the dialog finish closing and the message finish sliding in, for a still picture.
    await dialog.waitFor({ state: 'hidden' })
    await waitForStillness(page)
    await picturesOf(page)('stations')
    await page.close()
  })

  it('shows a taken code under the Code field', async () => {
    // The browser context still holds the admin session of the test above.
    const page = await openPage(e2e, 'stations-duplicate')
    await page.goto(`${e2e.app.baseUrl}/admin/stations`)
    await page.locator('.el-table__row').first().waitFor()
    const takenCode = (await page.locator('.el-table__row .wm-code').first().textContent())!.trim()

    await page.getByRole('button', { name: 'New station' }).click()
    const dialog = page.getByRole('dialog', { name: 'New station' })
    await dialog.getByLabel('Code').fill(takenCode)
    await dialog.getByLabel('Name').fill('Duplicate bench')
    await dialog.locator('.el-select').click()
    await page.getByRole('option', { name: 'Winding', exact: true }).click()
    await dialog.getByRole('button', { name: 'Add station' }).click()

    await dialog.locator('.el-form-item__error', { hasText: 'Already in use' }).waitFor()
    await page.close()
  })
})
