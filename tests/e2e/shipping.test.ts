import type { Page } from 'playwright-core'
import { beforeAll, describe, expect, it } from 'vitest'
import { Unit } from '../../server/models'
import { resetSignInLimits, signedInAs, uniqueSuffix } from '../api/support/client'
import { loadTestRun, releasedTestLot, windingRun } from '../api/support/floor'
import { screenshotOnFailure } from './support/browser'
import { picturesOf, signInHere, useE2eApp } from './support/setup'

describe('Shipping screen', () => {
  let page: Page
  let passed: string[]
  let unfinished: string
  let customerName: string

  const e2e = useE2eApp({ before: prepare })
  beforeAll(async () => {
    page = await e2e.browser.newPage()
  })

  async function prepare() {
    await resetSignInLimits()
    // Units to ship, made through the same API the Floor uses: two pass both steps, one stops
    // after the first.
    const [engineer, lead, stores, operator, service] = await Promise.all(
      ['engineer', 'lead', 'stores', 'operator', 'service'].map(signedInAs),
    )
    const t = await releasedTestLot({ engineer, lead, stores }, 3)
    passed = t.units.slice(0, 2).map((u) => u.serial)
    unfinished = t.units[2]!.serial
    for (const s of passed) {
      await operator.post('/api/step-runs', windingRun(t, s)).expect(201)
      await operator.post('/api/step-runs', loadTestRun(s, 350)).expect(201)
    }
    await operator.post('/api/step-runs', windingRun(t, unfinished)).expect(201)
    customerName = `Quarrymoor Signals ${uniqueSuffix()}`
    await service
      .post('/api/customers', { name: customerName, contactEmail: 'buyer@quarrymoor.example' })
      .expect(201)
  }

  it('packs by scanning serials with the keyboard alone, refuses an unfinished unit, ships', async () => {
    screenshotOnFailure(page, 'shipping')
    await page.goto(`${e2e.app.baseUrl}/shipping`)
    await signInHere(page, 'service')
    await page.waitForURL((u) => u.pathname === '/shipping')
    const scanBox = page.locator('[data-test="ship-scan"]')
    await scanBox.waitFor()
    // The scan box has the focus on arrival, so a wedge scanner types straight into it.
    await page.waitForFunction(() => document.activeElement?.id === 'ship-scan')

    const log = page.locator('[data-test="ship-log"] li')
    for (const [i, serial] of passed.entries()) {
      await page.keyboard.type(serial)
      await page.keyboard.press('Enter')
      await expect.poll(() => log.count()).toBe(i + 1)
      expect(await log.first().textContent()).toContain('added')
    }
    // A traveler URL works as well as a bare serial; an unfinished unit is listed as refused.
    await page.keyboard.type(`${e2e.app.baseUrl}/u/${unfinished}`)
    await page.keyboard.press('Enter')
    await expect.poll(() => log.count()).toBe(3)
    expect(await log.first().getAttribute('class')).toContain('is-refused')
    expect(await log.first().textContent()).toMatch(/not passed/)
    // Scanning the same box twice does not add it twice.
    await page.keyboard.type(passed[0]!)
    await page.keyboard.press('Enter')
    await expect.poll(() => log.count()).toBe(4)
    expect(await log.first().textContent()).toContain('already in this shipment')
    expect(await page.locator('[data-test="ship-count"]').textContent()).toMatch(/2\s+units/)
    // Focus stays in the scan box after every scan.
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('ship-scan')

    await page.locator('[data-test="ship-customer"]').click()
    await page.keyboard.type(customerName.slice(0, 14))
    await page.getByRole('option', { name: customerName }).click()
    await page.locator('input[placeholder="their PO number"]').fill('QS-5512')
    await picturesOf(page)('shipping-packed')
    await page.locator('[data-test="ship-confirm"]').click()
    // It asks first, naming the customer.
    const sure = page.locator('.el-message-box')
    await sure.getByText(`2 units go to ${customerName}`, { exact: false }).waitFor()
    await sure.getByRole('button', { name: 'Ship', exact: true }).click()

    const drawer = page.locator('.el-drawer:not(.shell-menu)')
    await drawer.getByText('Packing slip').first().waitFor()
    expect(await drawer.textContent()).toContain(customerName)
    for (const s of passed)
      expect((await Unit.findOne({ where: { serial: s } }))!.state).toBe('shipped')
    expect((await Unit.findOne({ where: { serial: unfinished } }))!.state).toBe('in_progress')
    await picturesOf(page)('shipping-shipped')
  })
})
