import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { CheckDto, RevisionDto } from '../../../shared/schemas/recipes'
import type { LotGridDto } from '../../../shared/schemas/lots'
import {
  DEMO_ROUTE,
  linesAt,
  releaseNewLot,
  revisionsWithRoute,
  stationOf,
  stepRunBody,
  usableLotCodes,
} from '../support/demo'
import { callApi, openPageSignedIn, signInAs, signInByApi, useE2eApp } from '../support/setup'

/** "<first passes> of <first attempts>" under a step's bar in the first-pass yield chart. */
async function stepCounts(page: Page, lotNumber: string, stepName: string): Promise<string> {
  await page.goto(`${page.url().split('/').slice(0, 3).join('/')}/yield`)
  const row = page.locator('.el-table__row', { hasText: lotNumber })
  await row.click()
  const chart = page.locator('section', { hasText: 'First-pass yield per step' }).locator('svg')
  await expect.poll(() => chart.textContent()).toMatch(new RegExp(`${stepName}\\s*\\d+ of \\d+`))
  const text = (await chart.textContent())!
  return text.match(new RegExp(`${stepName}\\s*(\\d+ of \\d+)`))![1]!
}

describe('Lead journey', () => {
  const e2e = useE2eApp()

  it('sees a failed first attempt lower the step’s yield, sends the unit to rework, and the re-pass does not count as first', async () => {
    // A new lot of two units of a demo product that starts at winding, for figures of its own.
    const page = await openPageSignedIn(e2e, 'journey-lead', 'lead')
    const isLimited = (c: CheckDto) =>
      c.kind === 'numeric' &&
      !c.derived &&
      c.lower !== null &&
      c.upper !== null &&
      c.lower < c.upper
    const revision = (await revisionsWithRoute(page, DEMO_ROUTE)).find(
      (r: RevisionDto) =>
        r.steps[0]!.stationKind === 'winding' && r.steps[0]!.checks.some(isLimited),
    )
    expect(revision, 'a released demo revision that starts at winding').toBeTruthy()
    const rev = revision!
    const step = rev.steps[0]!
    const check = step.checks.find(isLimited)!
    const { lot, units } = await releaseNewLot(page, rev.id, 2, 'Journey: lead')
    const [good, bad] = units.map((u) => u.serial) as [string, string]
    const codes = await usableLotCodes(page, linesAt(rev, step))
    const station = await stationOf(page, 'winding')
    const defects = await callApi<{ id: string; stationKinds: string[]; isActive: boolean }[]>(
      page,
      '/defect-codes',
    )
    const defect = defects.find((d) => d.isActive && d.stationKinds.includes('winding'))!
    await callApi(page, '/auth/logout', 'POST')

    // The operator's first unit passes winding.
    await signInByApi(page, 'operator')
    await callApi(page, '/step-runs', 'POST', stepRunBody(rev, step, good, station, codes))
    await callApi(page, '/auth/logout', 'POST')

    await signInAs(e2e, page, 'lead', '/yield')
    expect(await stepCounts(page, lot.number, step.name)).toBe('1 of 1')

    // The second fails: the check reads far above its upper limit.
    const high = check.upper! + (check.upper! - check.lower!)
    await callApi(page, '/auth/logout', 'POST')
    await signInByApi(page, 'operator')
    await callApi(
      page,
      '/step-runs',
      'POST',
      stepRunBody(rev, step, bad, station, codes, { [check.key]: high }, defect.id),
    )
    await callApi(page, '/auth/logout', 'POST')
    await signInAs(e2e, page, 'lead', '/yield')
    expect(await stepCounts(page, lot.number, step.name)).toBe('1 of 2')

    // On the lot page the lead decides: rework, back to winding.
    await page.goto(`${e2e.app.baseUrl}/lots/${lot.id}`)
    const nc = page.locator(`.ncs__row[data-serial="${bad}"]`)
    await nc.waitFor()
    expect(await nc.textContent()).toContain(check.label)
    await nc.getByRole('button', { name: 'Decide…' }).click()
    const dialog = page.getByRole('dialog', { name: `Decide on ${bad}` })
    await dialog.locator('.wm-choice', { hasText: 'Rework' }).click()
    await dialog.locator('.el-select').click()
    await page.getByRole('option', { name: `${step.position}. ${step.name}` }).click()
    await dialog.getByRole('textbox').fill('Rewind: inductance far over the limit')
    await dialog.getByRole('button', { name: 'Rework', exact: true }).click()
    await page.getByRole('button', { name: 'Send to rework' }).click()
    await dialog.waitFor({ state: 'hidden' })
    await page.getByText('No open nonconformance: nothing waits for a decision.').waitFor()
    const grid = await callApi<LotGridDto>(page, `/lots/${lot.id}/grid`)
    expect(grid.units.find((u) => u.serial === bad)!.reworkCount).toBe(1)

    // Reworked and wound again, it passes; the step's first-pass figure stays as it was.
    await callApi(page, '/auth/logout', 'POST')
    await signInByApi(page, 'operator')
    await callApi(page, '/step-runs', 'POST', stepRunBody(rev, step, bad, station, codes))
    await callApi(page, '/auth/logout', 'POST')
    await signInAs(e2e, page, 'lead', '/yield')
    expect(await stepCounts(page, lot.number, step.name)).toBe('1 of 2')
    await page.close()
  })
})
