import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { LotDto } from '../../shared/schemas/lots'
import { evaluateLotStep, lotStepsRunSince } from '../../server/services/quality'
import { DEMO_ORDER_REFS } from '../../server/seed/demoPlans'
import { openPage, picturesOf, signInAs, useE2eApp } from './support/setup'

/** The demo lots, read through the API with the page's session. */
function demoLots(page: Page): Promise<LotDto[]> {
  return page.evaluate(async () => (await fetch('/api/lots')).json()) as Promise<LotDto[]>
}

/** Judges every lot step of the demo data, as the alerts worker would after its scans. */
async function judgeDemo(): Promise<void> {
  for (const { lotId, stepId } of await lotStepsRunSince(new Date(0)))
    await evaluateLotStep(lotId, stepId)
}

describe('Yield board', () => {
  const e2e = useE2eApp({ before: judgeDemo })

  it('shows open alerts one line each above the figures, which stay on the first screen', async () => {
    const page = await openPage(e2e, 'yield-alerts')
    // The tabs of one run share their cookies: start each test signed out.
    await page.context().clearCookies()
    await page.setViewportSize({ width: 1280, height: 800 })
    await signInAs(e2e, page, 'lead', '/yield')
    await page.getByRole('heading', { name: 'Yield board' }).waitFor()
    const panel = page.getByRole('region', { name: 'Quality alerts' })
    await expect.poll(() => panel.textContent()).toMatch(/\d+ open alert/)
    const lines = panel.locator('.alerts__item')
    expect(await lines.count()).toBeLessThanOrEqual(4)
    // Each alert is one line: no taller than two rows of text.
    for (const box of await lines.evaluateAll((els) => els.map((e) => e.clientHeight)))
      expect(box).toBeLessThan(48)
    // The figures start on the first screen, whatever the number of alerts.
    const lots = page.getByRole('heading', { name: /^Lots/ })
    await lots.waitFor()
    expect((await lots.boundingBox())!.y).toBeLessThan(800)
    if ((await lines.count()) > 0) {
      await panel.getByRole('button', { name: 'Figures' }).first().click()
      await panel.locator('.alerts__figures').waitFor()
    }
    await picturesOf(page)('yield-alerts')
  })

  it('shows each e-mail once in the Outbox, sent ones with their receipt', async () => {
    const page = await openPage(e2e, 'outbox')
    await page.context().clearCookies()
    await page.setViewportSize({ width: 1280, height: 800 })
    await signInAs(e2e, page, 'admin', '/outbox')
    await page.getByRole('heading', { name: 'Outbox' }).waitFor()
    await page.locator('.el-table__row').first().waitFor()
    const rows = await page
      .locator('.el-table__row')
      .evaluateAll((trs) => trs.map((tr) => (tr as HTMLElement).innerText.split('\t')))
    // A message the app sent never shows again as a received copy of the same subject.
    const sent = new Set(rows.filter((r) => !/Received/.test(r[0] ?? '')).map((r) => r[2]))
    const copies = rows.filter((r) => /Received/.test(r[0] ?? '') && sent.has(r[2]))
    expect(copies).toEqual([])
    await picturesOf(page)('outbox')
  })

  it('shows a lead the miscount lot and names the winding bench that caused it', async () => {
    const page = await openPage(e2e, 'yield-board')
    await page.context().clearCookies()
    const picture = picturesOf(page)

    await signInAs(e2e, page, 'lead', '/yield')
    await page.waitForURL(/\/yield$/)
    await page.getByRole('heading', { name: 'Yield board' }).waitFor()
    // The navigation offers the area to the lead.
    await page.locator('nav[aria-label="Areas"]').getByRole('link', { name: 'Yield' }).waitFor()

    // The demo's past lies in the six weeks before the seed ran: open the period from the day
    // the miscount lot was released.
    const lot = (await demoLots(page)).find((l) => l.orderRef === DEMO_ORDER_REFS.miscount)!
    const from = page.getByLabel('Period from')
    await from.fill(lot.releasedAt!.slice(0, 10))
    await from.press('Enter')
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
