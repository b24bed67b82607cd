import { describe, expect, it } from 'vitest'
import type { LotDto } from '../../shared/schemas/lots'
import type { StatisticsDto } from '../../shared/schemas/statistics'
import { openPage, picturesOf, signInAs, useE2eApp } from './support/setup'

describe('statistics on any check', () => {
  const e2e = useE2eApp()

  it('draws the I-MR chart of the efficiency picked on the lot page', async () => {
    const page = await openPage(e2e, 'lot-statistics')
    await page.context().clearCookies()
    await page.setViewportSize({ width: 1280, height: 900 })
    await signInAs(e2e, page, 'lead', '/lots')
    // A demo lot with efficiency readings, found through the API with the page's session.
    const found = await page.evaluate(async () => {
      const lots = (await (await fetch('/api/lots')).json()) as LotDto[]
      for (const lot of lots) {
        if (lot.status === 'planned') continue
        const res = await fetch(`/api/yield/lots/${lot.id}/statistics`)
        const stats = (await res.json()) as StatisticsDto
        const eff = stats.checks.find((c) => c.key === 'efficiency_pct' && c.readings >= 8)
        if (eff) return { lotId: lot.id, number: lot.number, label: eff.label }
      }
      return null
    })
    expect(found).not.toBeNull()
    await page.goto(`${e2e.app.baseUrl}/lots/${found!.lotId}`)
    const panel = page.locator('[data-test="lot-statistics"]')
    await panel.waitFor()
    await panel.scrollIntoViewIfNeeded()
    await panel.locator('[data-test="check-picker"]').click()
    await page
      .locator('.el-select-dropdown__item:visible', { hasText: found!.label })
      .first()
      .click()
    const chart = panel.locator('[data-test="individuals-chart"] svg')
    await chart.waitFor()
    await expect
      .poll(() => panel.locator('[data-test="check-figures"]').textContent())
      .toMatch(/Cpk\s*\d+\.\d\d\s*95 %/)
    await panel.locator('[data-test="mr-chart"] svg').waitFor()
    await picturesOf(page)('lot-statistics')
  })
})
