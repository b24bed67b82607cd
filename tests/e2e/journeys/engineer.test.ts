import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import { limitText } from '../../../shared/recipes/limitText'
import type { CheckDto, ProductDto, RevisionDto } from '../../../shared/schemas/recipes'
import {
  DEMO_ROUTE,
  releaseNewLot,
  revisionsWithRoute,
  stationOf,
  unitWaitingAtStart,
} from '../support/demo'
import { scanTraveler } from '../support/floorDriver'
import { callApi, openPageSignedIn, signInAs, signInByApi, useE2eApp } from '../support/setup'

/** The limits the Floor shows beside a check of the open step. */
async function limitsShown(page: Page, serial: string, key: string): Promise<string> {
  await scanTraveler(page, serial)
  return (await page.locator(`[data-check="${key}"] .check-row__limits`).textContent())!.trim()
}

describe('Engineer journey', () => {
  const e2e = useE2eApp()

  it('makes the next revision, tightens a limit, releases it; new lots use it, old units keep theirs', async () => {
    // The newest released revision of a demo product whose route starts at winding with a
    // numeric check between two limits, and a unit of it waiting there (set up as the lead).
    const page = await openPageSignedIn(e2e, 'journey-engineer', 'lead')
    const products = await callApi<ProductDto[]>(page, '/products')
    const isNewest = (r: RevisionDto) => {
      const letters = products.find((p) => p.id === r.productId)!.revisions.map((x) => x.letter)
      return letters.every((l) => l <= r.letter)
    }
    const hasLimits = (c: CheckDto) =>
      c.kind === 'numeric' &&
      !c.derived &&
      c.lower !== null &&
      c.upper !== null &&
      c.nominal !== null &&
      c.lower < c.upper
    const old = (await revisionsWithRoute(page, DEMO_ROUTE)).find(
      (r) =>
        isNewest(r) && r.steps[0]!.stationKind === 'winding' && r.steps[0]!.checks.some(hasLimits),
    )
    expect(old, 'a demo revision to make the next one from').toBeTruthy()
    const check = old!.steps[0]!.checks.find(hasLimits)!
    const oldUnit = await unitWaitingAtStart(page, old!, 'Journey: engineer, old revision')
    const station = await stationOf(page, 'winding')
    await callApi(page, '/auth/logout', 'POST')

    // The engineer opens the released revision and makes a draft of the next letter from it.
    await signInAs(e2e, page, 'engineer', `/recipes/revisions/${old!.id}`)
    await page.getByRole('button', { name: /New revision from this one/ }).click()
    await page.waitForURL(
      (u) => !u.pathname.endsWith(old!.id) && /\/recipes\/revisions\//.test(u.pathname),
    )
    const draftId = new URL(page.url()).pathname.split('/').pop()!
    const draft = await callApi<RevisionDto>(page, `/revisions/${draftId}`)
    expect(draft.status).toBe('draft')
    expect(draft.letter > old!.letter).toBe(true)
    await page
      .locator('.el-message--success', {
        hasText: `Draft ${draft.letter} made from revision ${old!.letter}`,
      })
      .waitFor()

    // Tightens the check's upper limit halfway to its nominal.
    const upper = Number(((check.nominal! + check.upper!) / 2).toFixed(check.decimals))
    const card = page.getByRole('article', {
      name: new RegExp(`^Step 1: ${draft.steps[0]!.name}$`),
    })
    await card.getByRole('row', { name: new RegExp(check.key) }).click()
    const dialog = page.getByRole('dialog', { name: `Edit check ${check.key}` })
    await dialog.getByLabel('Upper limit').fill(String(upper))
    await dialog.getByLabel('Upper limit').press('Tab')
    await dialog.getByRole('button', { name: 'Save check' }).click()
    await dialog.waitFor({ state: 'hidden' })
    await expect
      .poll(
        async () =>
          (await callApi<RevisionDto>(page, `/revisions/${draftId}`)).steps[0]!.checks.find(
            (c) => c.key === check.key,
          )!.upper,
      )
      .toBe(upper)

    // Releases it, confirmed in the dialog.
    await page.getByRole('button', { name: /^Release revision/ }).click()
    const confirm = page.getByRole('dialog', { name: 'Release revision' })
    await confirm.getByRole('button', { name: `Release ${draft.letter}` }).click()
    await page
      .locator('.el-message--success', { hasText: `Revision ${draft.letter} released` })
      .waitFor()
    await page.getByRole('status').filter({ hasText: 'Released — frozen' }).waitFor()
    await callApi(page, '/auth/logout', 'POST')

    // The lead plans a new lot: it is built to the new revision.
    await signInByApi(page, 'lead')
    const { lot, units } = await releaseNewLot(page, draftId, 1, 'Journey: engineer, new revision')
    expect(lot.revisionLetter).toBe(draft.letter)
    await callApi(page, '/auth/logout', 'POST')

    // On the Floor the new unit is judged by the new limit, the old one still by the old.
    await signInAs(e2e, page, 'engineer', `/floor/${station}`)
    const newLimits = await limitsShown(page, units[0]!.serial, check.key)
    const oldLimits = await limitsShown(page, oldUnit.serial, check.key)
    expect(newLimits.split(' · ')[0]).toBe(limitText({ ...check, upper }, 'bench'))
    expect(oldLimits.split(' · ')[0]).toBe(limitText(check, 'bench'))
    expect(newLimits).not.toBe(oldLimits)
    await page.close()
  })
})
