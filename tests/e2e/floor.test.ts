import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { LotDto, LotGridDto, UnitSummaryDto } from '../../shared/schemas/lots'
import type { ComponentLotDto, PageDto } from '../../shared/schemas/componentLots'
import type { ProductDto } from '../../shared/schemas/recipes'
import {
  DEMO_PASSWORD,
  callApi,
  demoEmail,
  openPage,
  picturesOf,
  signInByApi,
  useE2eApp,
  waitForStillness,
} from './support/setup'

/** The id of the focused element's `data-field`, or its id. */
function focusedField(page: Page): Promise<string | null> {
  return page.evaluate(() => {
    const el = document.activeElement
    return el?.getAttribute('data-field') ?? el?.id ?? null
  })
}

async function waitForFocus(page: Page, field: string): Promise<void> {
  await page.waitForFunction((f) => {
    const el = document.activeElement
    return el?.getAttribute('data-field') === f || el?.id === f
  }, field)
}

interface Job {
  lotId: string
  serial: string
  windingStepId: string
  /** Part number to the internal code of a lot that may be fitted today. */
  lotCodes: Map<string, string>
}

/**
 * As the lead, through the API: a unit of FP24 rev B queued at Winding (a new one-unit lot is
 * released when the seeded ones are used up) and a usable component lot per part.
 */
async function prepareJob(page: Page): Promise<Job> {
  const lots = await callApi<LotDto[]>(page, '/lots')
  let unit: UnitSummaryDto | undefined
  let lotId = ''
  for (const lot of lots.filter(
    (l) => l.productCode === 'FP24' && l.revisionLetter === 'B' && !l.isOnHold,
  )) {
    if (lot.status !== 'released' && lot.status !== 'in_progress') continue
    const units = await callApi<UnitSummaryDto[]>(page, `/lots/${lot.id}/units`)
    unit = units.find((u) => u.state === 'queued' && u.currentStep?.stationKind === 'winding')
    if (unit) {
      lotId = lot.id
      break
    }
  }
  if (!unit) {
    const products = await callApi<ProductDto[]>(page, '/products')
    const revision = products
      .find((p) => p.code === 'FP24')!
      .revisions.find((r) => r.letter === 'B')!
    const lot = await callApi<LotDto>(page, '/lots', 'POST', {
      revisionId: revision.id,
      quantity: 1,
      orderRef: 'E2E floor',
    })
    await callApi(page, `/lots/${lot.id}/release`, 'POST', {})
    lotId = lot.id
    unit = (await callApi<UnitSummaryDto[]>(page, `/lots/${lot.id}/units`))[0]!
  }
  const grid = await callApi<LotGridDto>(page, `/lots/${lotId}/grid`)
  const stock = await callApi<PageDto<ComponentLotDto>>(
    page,
    '/component-lots?status=available&pageSize=200',
  )
  const lotCodes = new Map<string, string>()
  for (const c of stock.rows)
    if (!c.isExpired && c.quantityRemaining >= 10 && !lotCodes.has(c.partNumber))
      lotCodes.set(c.partNumber, c.internalCode)
  return {
    lotId,
    serial: unit.serial,
    windingStepId: grid.steps.find((s) => s.stationKind === 'winding')!.id,
    lotCodes,
  }
}

describe('Floor station screen', () => {
  const e2e = useE2eApp()

  it('records a winding step with the keyboard alone, and the lot grid shows it passed first time', async () => {
    const page = await openPage(e2e, 'floor-keyboard')
    const picture = picturesOf(page)

    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'lead')
    const job = await prepareJob(page)
    await callApi(page, '/auth/logout', 'POST')

    // From here on the operator uses the keyboard only.
    await page.goto(`${e2e.app.baseUrl}/floor/WND-1`)
    await page.waitForURL(/\/signin\?next=/)
    const email = page.locator('input[name="email"]')
    await email.waitFor()
    for (let i = 0; i < 10 && !(await email.evaluate((el) => el === document.activeElement)); i++)
      await page.keyboard.press('Tab')
    await page.keyboard.type(demoEmail('operator'))
    await page.keyboard.press('Tab')
    await page.keyboard.type(DEMO_PASSWORD)
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/floor\/WND-1$/)
    await waitForFocus(page, 'scan')
    await waitForStillness(page)
    await picture('floor-before-scan')

    await page.keyboard.type(job.serial)
    await page.keyboard.press('Enter')
    await waitForFocus(page, 'check:primary_a_turns')
    expect(await page.locator('[data-test="unit-serial"]').textContent()).toBe(job.serial)

    for (const reading of ['6', '6', '92']) {
      await page.keyboard.type(reading)
      await page.keyboard.press('Enter')
    }
    // 150 µH is above the 81 – 135 µH limits: the field turns red while it is typed.
    await waitForFocus(page, 'check:l_primary_a')
    await page.keyboard.type('150')
    const inductance = page.locator('[data-field="check:l_primary_a"]')
    await expect.poll(() => inductance.getAttribute('class')).toContain('is-fail')
    expect(await page.locator('[data-check="l_primary_a"]').getAttribute('data-verdict')).toBe(
      'fail',
    )
    expect(await page.locator('[data-test="verdict"]').getAttribute('data-verdict')).toBe('fail')
    await waitForStillness(page)
    await picture('floor-failing-value')

    await page.keyboard.press('Control+A')
    await page.keyboard.type('108')
    await expect.poll(() => inductance.getAttribute('class')).toContain('is-pass')
    await page.keyboard.press('Enter')
    for (const reading of ['107', '25.4', '10.00', '153.3']) {
      await page.keyboard.type(reading)
      await page.keyboard.press('Enter')
    }
    await waitForFocus(page, 'check:tape_fitted')
    await page.keyboard.press('y')
    await page.keyboard.press('Enter')

    // One lot label per BOM line fitted at winding; Enter in the last one records the run.
    const parts = (await page.locator('.material .material__name .wm-code').allTextContents()).map(
      (p) => p.trim(),
    )
    expect(parts.length).toBeGreaterThan(0)
    for (const [i, part] of parts.entries()) {
      const code = job.lotCodes.get(part)
      expect(code, `a usable component lot of ${part}`).toBeTruthy()
      await page.keyboard.type(code!)
      if (i < parts.length - 1) await page.keyboard.press('Enter')
    }
    // The last lot is checked once typing pauses; until then the bar does not say PASS.
    await expect
      .poll(() => page.locator('[data-test="verdict"]').getAttribute('data-verdict'))
      .toBe('pass')
    await page.keyboard.press('Enter')

    const notice = page.locator('[data-test="floor-notice"]')
    await notice.waitFor()
    expect(await notice.textContent()).toContain(`PASS · ${job.serial}`)
    await waitForFocus(page, 'scan')
    await page.locator(`.recent__item[data-serial="${job.serial}"]`).first().waitFor()
    await waitForStillness(page)
    await picture('floor-after-submit')
    expect(await focusedField(page)).toBe('scan')

    // The lead sees the unit's winding cell as passed first time.
    await callApi(page, '/auth/logout', 'POST')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'lead')
    await page.goto(`${e2e.app.baseUrl}/lots/${job.lotId}`)
    const cell = page.locator(
      `tr[data-serial="${job.serial}"] td[data-step="${job.windingStepId}"] .grid-cell`,
    )
    await cell.waitFor()
    expect(await cell.getAttribute('data-cell')).toBe('passed_first')
    await cell.scrollIntoViewIfNeeded()
    await waitForStillness(page)
    await picture('lot-grid')
    await page.close()
  })
})
