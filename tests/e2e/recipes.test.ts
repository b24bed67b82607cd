import { randomInt } from 'node:crypto'
import type { Locator, Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { openPage, picturesOf, signInHere, useE2eApp, waitForStillness } from './support/setup'

const CODE_CHARACTERS = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789'

/** A product code no earlier run is likely to have taken: E and four letters or digits. */
function uniqueProductCode(): string {
  let code = 'E'
  for (let i = 0; i < 4; i++) code += CODE_CHARACTERS[randomInt(CODE_CHARACTERS.length)]
  return code
}

interface NumericCheck {
  key: string
  label: string
  unit: string
  lower: number
  nominal: number
  upper: number
}

/**
 * Picks an option of an Element Plus select; the option list opens in a popper on the page.
 * On a busy machine a click can land while the list is still opening and pick nothing, so it
 * waits for the select to show the option and tries again (three times at most).
 */
async function choose(page: Page, select: Locator, option: string): Promise<void> {
  const item = page.getByRole('option', { name: option, exact: true })
  // The select's outer box (the locator may be its inner input) shows the chosen label.
  const box = select.locator(
    'xpath=ancestor-or-self::div[contains(concat(" ", normalize-space(@class), " "), " el-select ")][1]',
  )
  for (let attempt = 1; ; attempt++) {
    if (!(await item.isVisible())) await select.click()
    await item.click()
    try {
      await box.getByText(option, { exact: true }).waitFor({ timeout: 5_000 })
      return
    } catch (error) {
      if (attempt === 3) throw error
    }
  }
}

/** Appends a step to the route through the New step dialog. */
async function addStep(page: Page, name: string, stationKind: string): Promise<Locator> {
  await page.getByRole('button', { name: 'Add step', exact: true }).click()
  const dialog = page.getByRole('dialog', { name: 'New step' })
  await dialog.getByLabel('Step name').fill(name)
  await choose(page, dialog.locator('.el-select'), stationKind)
  await dialog.getByRole('button', { name: 'Add step', exact: true }).click()
  await dialog.waitFor({ state: 'hidden' })
  const card = page.getByRole('article', { name: new RegExp(`^Step \\d+: ${name}$`) })
  await card.waitFor()
  return card
}

/** Adds a numeric check to the step shown by `card`, through the New check dialog. */
async function addNumericCheck(page: Page, card: Locator, check: NumericCheck): Promise<void> {
  await card.getByRole('button', { name: 'Add check', exact: true }).click()
  const dialog = page.getByRole('dialog', { name: /^New check on step \d+/ })
  await dialog.getByLabel('Key').fill(check.key)
  await dialog.getByLabel('Label the operator reads').fill(check.label)
  // Number is the kind a new check starts with.
  expect(await dialog.getByRole('radio', { name: 'Number' }).isChecked()).toBe(true)
  await choose(page, dialog.getByLabel('Unit'), check.unit)
  // The limit fields take their number when the field is left.
  await dialog.getByLabel('Lower limit').fill(String(check.lower))
  await dialog.getByLabel('Lower limit').press('Tab')
  await dialog.getByLabel('Nominal').fill(String(check.nominal))
  await dialog.getByLabel('Nominal').press('Tab')
  await dialog.getByLabel('Upper limit').fill(String(check.upper))
  await dialog.getByLabel('Upper limit').press('Tab')
  await dialog.getByRole('button', { name: 'Add check', exact: true }).click()
  await dialog.waitFor({ state: 'hidden' })
  await card.getByRole('row', { name: new RegExp(check.key) }).waitFor()
}

describe('Recipes screen', () => {
  const e2e = useE2eApp()

  it('lets an engineer build a two-step route with three checks and release it', async () => {
    const code = uniqueProductCode()
    const page = await openPage(e2e, 'recipes-release')

    await page.goto(`${e2e.app.baseUrl}/recipes`)
    await page.waitForURL(/\/signin\?next=/)
    await signInHere(page, 'engineer')
    await page.waitForURL(/\/recipes$/)
    await page.getByRole('heading', { name: 'Recipes', exact: true }).waitFor()

    // A new product comes with an empty draft revision A.
    await page.getByRole('button', { name: 'New product' }).click()
    const productDialog = page.getByRole('dialog', { name: 'New product' })
    await productDialog.getByLabel('Product code').fill(code)
    await productDialog.getByLabel('Name').fill('End-to-end flyback, 12 V in, 48 V out')
    await productDialog.getByRole('button', { name: 'Create product' }).click()
    await page.locator('.el-message--success', { hasText: 'draft revision A' }).waitFor()
    await productDialog.waitFor({ state: 'hidden' })

    const product = page.getByRole('article').filter({ hasText: code })
    await product.getByRole('link', { name: /Rev A\s*Draft/i }).click()
    await page.waitForURL(/\/recipes\/revisions\/[0-9a-f-]{36}$/)
    const revisionId = new URL(page.url()).pathname.split('/').pop()!
    await page.getByText('Revision A', { exact: true }).waitFor()
    await page.getByText('The route has no steps yet.').waitFor()

    // The route: winding, then load test, with two checks on the first step and one on the second.
    const winding = await addStep(page, 'Winding', 'Winding')
    const loadTest = await addStep(page, 'Load test', 'Load test')
    expect(await winding.getByRole('heading', { level: 3 }).textContent()).toBe('Winding')
    expect(await page.getByRole('article', { name: 'Step 2: Load test' }).count()).toBe(1)

    await addNumericCheck(page, winding, {
      key: 'l_primary',
      label: 'Primary inductance',
      unit: 'mH',
      lower: 0.9,
      nominal: 1,
      upper: 1.1,
    })
    await addNumericCheck(page, winding, {
      key: 'r_primary',
      label: 'Primary resistance',
      unit: 'mΩ',
      lower: 40,
      nominal: 50,
      upper: 60,
    })
    await addNumericCheck(page, loadTest, {
      key: 'v_out',
      label: 'Output voltage at full load',
      unit: 'V',
      lower: 47.5,
      nominal: 48,
      upper: 48.5,
    })
    await page.getByRole('tab', { name: 'Route and checks (2 steps, 3 checks)' }).waitFor()
    const strip = page.getByRole('navigation', { name: 'Steps of the route' })
    await strip.getByRole('button', { name: '1 Winding 2 checks' }).waitFor()
    await strip.getByRole('button', { name: '2 Load test 1 check' }).waitFor()
    await page.getByText('Nothing stops the release of this draft.').waitFor()

    // Release, confirmed in the dialog that says what it means.
    await page.getByRole('button', { name: /^Release revision/ }).click()
    const confirm = page.getByRole('dialog', { name: `Release revision A of ${code}` })
    await confirm.getByText('Lots can then be built to revision A').waitFor()
    await confirm.getByText('A first revision, made from nothing').waitFor()
    await confirm.getByRole('button', { name: 'Release A' }).click()
    await page.locator('.el-message--success', { hasText: 'Revision A released' }).waitFor()

    const banner = page.getByRole('status').filter({ hasText: 'Released — frozen' })
    await banner.waitFor()
    await banner.getByRole('button', { name: /New revision from this one/ }).waitFor()
    await page.getByRole('button', { name: 'Mark obsolete…' }).waitFor()
    // The status tag beside the letter changed from Draft to Released.
    await page.getByText('Released', { exact: true }).waitFor()
    expect(await page.getByText('Draft', { exact: true }).count()).toBe(0)

    // Frozen: nothing on the route can be changed any more.
    for (const name of [
      /^Release revision/,
      'Delete draft',
      'Add step',
      'Add check',
      'Edit step',
      'Delete',
    ])
      expect(await page.getByRole('button', { name, exact: true }).count()).toBe(0)
    expect(await page.getByRole('button', { name: /^Move step/ }).count()).toBe(0)
    expect(await page.getByRole('button', { name: /^Delete check/ }).count()).toBe(0)
    expect(await winding.getByRole('row', { name: /l_primary/ }).count()).toBe(1)

    // The server holds the same: released, two steps, three checks.
    const saved = await page.evaluate(async (id) => {
      const response = await fetch(`/api/revisions/${id}`, {
        credentials: 'same-origin',
        headers: { Accept: 'application/json' },
      })
      if (!response.ok) throw new Error(`GET /api/revisions/${id}: ${response.status}`)
      return (await response.json()) as RevisionDto
    }, revisionId)
    expect(saved.status).toBe('released')
    expect(saved.productCode).toBe(code)
    expect(saved.releasedAt).not.toBeNull()
    expect(saved.steps.map((s) => [s.position, s.name, s.stationKind])).toEqual([
      [1, 'Winding', 'winding'],
      [2, 'Load test', 'load_test'],
    ])
    expect(saved.steps.map((s) => s.checks.map((c) => c.key))).toEqual([
      ['l_primary', 'r_primary'],
      ['v_out'],
    ])
    expect(saved.steps.reduce((n, s) => n + s.checks.length, 0)).toBe(3)
    expect(saved.steps[0]!.checks[0]).toMatchObject({
      kind: 'numeric',
      unit: 'mH',
      lower: 0.9,
      nominal: 1,
      upper: 1.1,
    })
    expect(saved.steps[1]!.checks[0]).toMatchObject({ unit: 'V', lower: 47.5, upper: 48.5 })

    // A still picture of the frozen revision from its top: the check messages gone, the release
    // message settled, and the pointer off the check rows it would highlight.
    await expect.poll(() => page.locator('.el-message', { hasText: 'Check added' }).count()).toBe(0)
    await page.mouse.move(0, 0)
    await page.evaluate(() => window.scrollTo(0, 0))
    await waitForStillness(page)
    await picturesOf(page)('recipes-released')
    await page.close()
  })
})
