import { beforeAll, describe, expect, it } from 'vitest'
import { Unit } from '../../server/models'
import { resetSignInLimits, signedInAs } from '../api/support/client'
import { loadTestRun, releasedTestLot, windingRun } from '../api/support/floor'
import type { TestLot } from '../api/support/floor'
import { openPage, picturesOf, signInByApi, useE2eApp, waitForStillness } from './support/setup'

describe('ending a containment on the recall page', () => {
  const e2e = useE2eApp()
  // A lot of its own, so the demo's lots stay as the other tests expect them.
  let t: TestLot
  let serials: string[]

  beforeAll(async () => {
    await resetSignInLimits()
    const [engineer, lead, stores, operator] = await Promise.all(
      ['engineer', 'lead', 'stores', 'operator'].map(signedInAs),
    )
    t = await releasedTestLot({ engineer, lead, stores }, 3)
    serials = t.units.map((u) => u.serial)
    for (const s of serials) await operator.post('/api/step-runs', windingRun(t, s)).expect(201)
    await operator.post('/api/step-runs', loadTestRun(serials[0]!, 350)).expect(201)
    await lead
      .post(`/api/trace/component-lots/${t.componentLotCode}/contain`, {
        reason: 'supplier reports cracked cores in this batch',
      })
      .expect(200)
  })

  it('lets a lead reject the lot and then scrap one of its held units', async () => {
    const page = await openPage(e2e, 'containment-end')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'lead')
    await page.goto(`${e2e.app.baseUrl}/trace?lot=${t.componentLotCode}`)
    await page.locator('[data-test=recall-code]').waitFor()
    await page.locator('[data-test=end-containment]').click()
    const confirm = page.locator('[data-test=end-confirm]')
    await confirm.waitFor()
    expect(await confirm.isDisabled()).toBe(true) // no outcome, no reason yet
    await page.locator('[data-test=end-rejected]').click()
    await page.locator('#end-reason').fill('cores measured 30 % under their rated factor')
    expect(await confirm.isDisabled()).toBe(false)
    await picturesOf(page)('containment-end-dialog')
    await confirm.click()
    await page.locator('.el-overlay-dialog').first().waitFor({ state: 'hidden' })
    await page.getByRole('status').filter({ hasText: 'Containment ended, lot rejected' }).waitFor()

    const decide = page.locator(`[data-test=decide-${serials[1]}]`)
    await decide.waitFor()
    expect(await page.locator('[data-test^=decide-]').count()).toBe(3)
    await picturesOf(page)('containment-rejected')
    await decide.click()
    const dialog = page.getByRole('dialog', { name: `Decide on ${serials[1]}` })
    await dialog.getByText('fitted at').waitFor()
    await waitForStillness(page)
    await picturesOf(page)('containment-decide-dialog')
    await dialog.locator('.wm-choice', { hasText: 'Scrap' }).click()
    await dialog.getByRole('button', { name: 'Scrap' }).click()
    await expect
      .poll(async () => (await Unit.findOne({ where: { serial: serials[1]! } }))!.state)
      .toBe('scrapped')
    await expect.poll(() => page.locator('[data-test^=decide-]').count()).toBe(2)
    await page.close()
  })
})
