import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { LotDto } from '../../shared/schemas/lots'
import { MISCOUNT_ORDER_REF } from '../../server/seed/demoMiscountLot'
import { openPage, picturesOf, signInAs, useE2eApp } from './support/setup'

/** The demo lots, read through the API with the page's session. */
function demoLots(page: Page): Promise<LotDto[]> {
  return page.evaluate(async () => (await fetch('/api/lots')).json()) as Promise<LotDto[]>
}

describe('Yield board', () => {
  const e2e = useE2eApp()

  it('shows a lead the miscount lot and names the winding bench that caused it', async () => {
    const page = await openPage(e2e, 'yield-board')
    const picture = picturesOf(page)

    await signInAs(e2e, page, 'lead', '/yield')
    await page.waitForURL(/\/yield$/)
    await page.getByRole('heading', { name: 'Yield board' }).waitFor()
    // The navigation offers the area to the lead.
    await page.locator('nav[aria-label="Areas"]').getByRole('link', { name: 'Yield' }).waitFor()

    // The demo lot was wound in late November 2026: open the period from the start of November.
    const from = page.getByLabel('Period from')
    await from.fill('2026-11-01')
    await from.press('Enter')
    const lot = (await demoLots(page)).find((l) => l.orderRef === MISCOUNT_ORDER_REF)!
    const row = page.locator('.el-table__row', { hasText: lot.number })
    await row.waitFor()
    await picture('yield-board')

    await row.click()
    await page.getByRole('heading', { name: new RegExp(`Lot ${lot.number}`) }).waitFor()
    const panel = page.locator('article[data-verdict]')
    await panel.waitFor()
    const verdict = panel.getByRole('status')
    await expect.poll(() => verdict.textContent()).toContain('Miscount suspected')
    const text = (await verdict.textContent())!
    expect(text).toContain('Wound at WND-2')
    expect(text).toContain('the ratio test reads 94 turns where 92 are specified')
    expect(text).toContain('core lot')
    expect(await panel.locator('[data-test="suspects"]').textContent()).toContain('6 of 30 runs')
    // The bench table marks WND-2 in words, not only in colour.
    const wnd2 = panel.locator('table', { hasText: 'By bench' }).locator('tr', { hasText: 'WND-2' })
    expect(await wnd2.textContent()).toContain('most suspects')
    expect(await panel.locator('[data-test="suspect-list"] tbody tr').count()).toBe(6)
    // Units 11–16 in build order are the six at WND-2: each is beyond 3σ (rule 1).
    expect(await panel.locator('[data-test="rule-hits"]').textContent()).toContain(
      'Rule 1 (a point beyond 3σ): run 11–16',
    )
    await page.getByRole('heading', { name: 'First-pass yield per step' }).scrollIntoViewIfNeeded()
    await picture('yield-lot-detail')
    await page.getByRole('heading', { name: 'Turn-count deviation' }).scrollIntoViewIfNeeded()
    await picture('yield-turns')
    await page.emulateMedia({ media: 'print' })
    await picture('yield-print', true)
    await page.emulateMedia({ media: 'screen' })

    // The lot page carries the same panel.
    await page.goto(`${e2e.app.baseUrl}/lots/${lot.id}`)
    const onLot = page.locator('article[data-verdict]')
    await onLot.waitFor()
    expect(await onLot.getByRole('status').textContent()).toContain('WND-2')
    await page.getByRole('heading', { name: 'Turn-count deviation' }).scrollIntoViewIfNeeded()
    await picture('lot-turns')
  })
})
