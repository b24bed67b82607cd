import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { ProductDto, RevisionDto } from '../../shared/schemas/recipes'
import { callApi, openPage, picturesOf, signInAs, useE2eApp } from './support/setup'

/** Revision A (released) of a new product with a hipot and a load-test step, and draft B copied from it. */
async function releasedAndCopy(page: Page): Promise<{ a: RevisionDto; b: RevisionDto }> {
  const code = `H${Date.now().toString(36).slice(-5).toUpperCase()}`
  const product = await callApi<ProductDto>(page, '/products', 'POST', {
    code,
    name: `Hipot editing ${code}`,
  })
  const revId = product.revisions[0]!.id
  const hipot = await callApi<{ id: string }>(page, `/revisions/${revId}/steps`, 'POST', {
    name: 'Hipot',
    stationKind: 'hipot',
  })
  const load = await callApi<{ id: string }>(page, `/revisions/${revId}/steps`, 'POST', {
    name: 'Load test',
    stationKind: 'load_test',
  })
  for (const [stepId, check] of [
    [hipot.id, { key: 'leak', label: 'Leakage current', unit: 'mA', upper: 5 }],
    [load.id, { key: 'v_out', label: 'Output voltage', unit: 'V', lower: 345, upper: 355 }],
  ] as const)
    await callApi(page, `/steps/${stepId}/checks`, 'POST', { kind: 'numeric', ...check })
  const a = await callApi<RevisionDto>(page, `/revisions/${revId}/release`, 'POST', {})
  const copy = await callApi<RevisionDto>(page, `/revisions/${revId}/copy`, 'POST')
  const b = await callApi<RevisionDto>(page, `/revisions/${copy.id}`, 'PATCH', {
    workingVolts: 230,
  })
  return { a, b }
}

/** The value an Element Plus number box shows. */
const boxValue = (page: Page, label: string) =>
  page.getByRole('dialog').getByLabel(label, { exact: true }).inputValue()

describe('Recipe editing without friction', () => {
  const e2e = useE2eApp()

  it('explains refusals, keeps what was typed, suggests the hipot voltage and releases with a summary', async () => {
    const page = await openPage(e2e, 'recipes-editing')
    const picture = picturesOf(page)
    await signInAs(e2e, page, 'engineer')
    const { a, b } = await releasedAndCopy(page)
    await page.goto(`${e2e.app.baseUrl}/recipes/revisions/${b.id}`)
    const changes = page.locator('[data-test="revision-changes"]')
    await changes.getByText('Nothing changed against revision A yet.').waitFor()

    // A new check on the hipot step: the suggestion from 230 V (2·230 + 1000 = 1460 V AC,
    // DESIGN.md §7, common practice) with its caution, filled into the lower limit in one click.
    const hipot = page.getByRole('article', { name: 'Step 1: Hipot' })
    await hipot.getByRole('button', { name: 'Add check', exact: true }).click()
    const dialog = page.getByRole('dialog', { name: /^New check on step 1/ })
    await dialog.getByText('1460 V AC').waitFor()
    await dialog.getByText(/local codes and licensed practice govern/).waitFor()
    await dialog.locator('[data-test="hipot-fill-ac"]').click()
    expect(await boxValue(page, 'Lower limit')).toBe('1460')

    // An upper limit below the lower one: Save shows the field's message and keeps the dialog.
    // Every other field is valid: the refusal is said, and the limit's message stays under it.
    await dialog.getByLabel('Key').fill('leak')
    await dialog.getByLabel('Label the operator reads').fill('Applied test voltage')
    await dialog.getByLabel('Upper limit').fill('1000')
    await dialog.getByLabel('Upper limit').press('Tab')
    await dialog.getByRole('button', { name: 'Add check', exact: true }).click()
    await page.locator('.el-message--warning', { hasText: 'Not saved' }).waitFor()
    // The field's state, not the fading message: a passing field rule used to wipe it.
    const lowerItem = dialog.locator('.el-form-item').filter({ hasText: 'Lower limit' })
    expect(await lowerItem.getAttribute('class')).toMatch(/\bis-error\b/)
    await lowerItem.getByText('The lower limit must not exceed the upper limit').waitFor()
    await picture('recipes-check-limits-refused')

    // The server refuses a key already used: its message shows, and every typed value stays.
    await dialog.getByLabel('Upper limit').fill('1600')
    await dialog.getByLabel('Upper limit').press('Tab')
    await dialog.getByRole('button', { name: 'Add check', exact: true }).click()
    await dialog.getByText('Already used in this revision').waitFor()
    expect(await dialog.getByLabel('Label the operator reads').inputValue()).toBe(
      'Applied test voltage',
    )
    expect(await boxValue(page, 'Lower limit')).toBe('1460')
    expect(await boxValue(page, 'Upper limit')).toBe('1600')
    // A value typed into the try-out box, to see that the next new check starts without it.
    await dialog.getByRole('region', { name: 'Try a value' }).locator('input').first().fill('1500')
    await dialog.getByLabel('Key').fill('v_test')
    await dialog.getByRole('button', { name: 'Add check', exact: true }).click()
    await dialog.waitFor({ state: 'hidden' })
    await hipot.getByRole('row', { name: /v_test/ }).waitFor()
    const saved = await callApi<RevisionDto>(page, `/revisions/${b.id}`)
    expect(saved.steps[0]!.checks.find((c) => c.key === 'v_test')).toMatchObject({
      unit: 'V',
      lower: 1460,
      upper: 1600,
    })

    await hipot.getByRole('button', { name: 'Add check', exact: true }).click()
    await dialog.waitFor()
    expect(
      await dialog
        .getByRole('region', { name: 'Try a value' })
        .locator('input')
        .first()
        .inputValue(),
    ).toBe('')
    await dialog.getByRole('button', { name: 'Cancel' }).click()
    await dialog.waitFor({ state: 'hidden' })

    // Checks have a visible Edit action.
    await hipot.getByRole('button', { name: 'Edit check leak' }).click()
    await page.getByRole('dialog', { name: 'Edit check leak' }).waitFor()
    await page
      .getByRole('dialog', { name: 'Edit check leak' })
      .getByRole('button', { name: 'Cancel' })
      .click()

    // The change summary lists the new check; a blocker links to the check it names.
    await changes.getByText('check v_test added (on step 1 "Hipot")').waitFor()
    const loadStep = b.steps[1]!
    await callApi(page, `/steps/${loadStep.id}/checks`, 'POST', {
      key: 'noise',
      label: 'Ripple',
      kind: 'numeric',
      unit: 'mV',
    })
    await page.reload()
    await page.getByRole('tab', { name: /^Bill of materials/ }).click()
    const blocker = page.locator('[data-test="release-blocker"]', { hasText: 'check noise' })
    await blocker.click()
    const noiseRow = page.locator('[data-check-id][data-pointed="true"]')
    await noiseRow.waitFor()
    expect(await noiseRow.textContent()).toContain('noise')
    expect(await noiseRow.isVisible()).toBe(true)
    await picture('recipes-blocker-pointed')
    await page.getByRole('button', { name: 'Delete check noise' }).click()
    await page
      .getByRole('dialog', { name: 'Delete check' })
      .getByRole('button', { name: 'Delete', exact: true })
      .click()
    await page.getByText('Nothing stops the release of this draft.').waitFor()

    // Release: the confirmation shows the changes and what happens to revision A.
    await page.getByRole('button', { name: /^Release revision/ }).click()
    const confirm = page.getByRole('dialog', { name: /^Release revision B of/ })
    await confirm.getByText('What changes against revision A').waitFor()
    await confirm.getByText('check v_test added (on step 1 "Hipot")').waitFor()
    await confirm.getByText('Revision A, released now').waitFor()
    expect(await confirm.getByRole('radio', { name: /Make A obsolete/ }).isChecked()).toBe(true)
    await picture('recipes-release-summary')
    await confirm.locator('[data-test="release-confirm"]').click()
    await page
      .locator('.el-message--success', { hasText: 'Revision B released; A obsolete for new lots' })
      .waitFor()
    const products = await callApi<ProductDto[]>(page, '/products')
    const revisions = products.find((p) => p.id === a.productId)!.revisions
    expect(revisions.map((r) => `${r.letter}:${r.status}`).sort()).toEqual([
      'A:obsolete',
      'B:released',
    ])
    await page.close()
  })
})
