import type { Page } from 'playwright-core'
import { expect } from 'vitest'
import type { RevisionDto, StepDto } from '../../../shared/schemas/recipes'
import { freshItemSerial, linesAt, passingEntry } from './demo'
import { DEMO_PASSWORD, demoEmail } from './setup'
import type { DemoRole } from './setup'

/** Waits until the Floor's scan box has the focus, as it does whenever it waits for a traveler. */
export async function waitForScanBox(page: Page): Promise<void> {
  await page.waitForFunction(() => document.activeElement?.getAttribute('data-field') === 'scan')
}

/**
 * Scans a traveler at the open Floor station and waits until its step's form is shown. The scan
 * box is focused first: with a unit open, the focus sits in its first reading.
 */
export async function scanTraveler(page: Page, serial: string): Promise<void> {
  await page.locator('[data-field="scan"]').focus()
  await waitForScanBox(page)
  await page.keyboard.type(serial)
  await page.keyboard.press('Enter')
  await expect.poll(() => page.locator('[data-test="unit-serial"]').textContent()).toBe(serial)
}

/** Types each input check's passing entry into the open step's form. */
export async function typePassingReadings(page: Page, step: StepDto): Promise<void> {
  for (const check of step.checks) {
    const entry = passingEntry(check)
    if (entry === null) continue
    const field = page.locator(`[data-field="check:${check.key}"]`)
    if (check.kind === 'numeric' || check.kind === 'text') await field.fill(entry)
    else {
      // A tap on the option, as on the bench's touch screen: a key pressed while the Floor
      // moves the focus from the previous answer could land on that one instead.
      const option = check.kind === 'boolean' ? 0 : Number(entry) - 1
      await field.getByRole('radio').nth(option).click()
    }
    await expect
      .poll(() => page.locator(`[data-check="${check.key}"]`).getAttribute('data-verdict'))
      .toBe('pass')
  }
}

/**
 * Scans a component-lot label (and a fresh part serial where the line is serial traced) into
 * each material row of the open step, and waits until the Floor has accepted each lot.
 * @param codes part number to the internal code to scan
 */
export async function scanMaterials(
  page: Page,
  revision: RevisionDto,
  step: StepDto,
  codes: ReadonlyMap<string, string>,
): Promise<void> {
  for (const line of linesAt(revision, step)) {
    // Leaving the field checks the lot; Enter would too, but in the last field it also records.
    const lot = page.locator(`[data-field="lot:${line.id}"]`)
    await lot.fill(codes.get(line.partNumber)!)
    await lot.blur()
    if (line.traceLevel === 'serial')
      await page.locator(`[data-field="item:${line.id}"]`).fill(freshItemSerial(line.partNumber))
    await page.locator(`.material--ok[data-line="${line.id}"]`).waitFor()
  }
}

/**
 * Records the open step: presses Record and, where the step needs a second person, signs in
 * that person's name in the dialog. Waits for the PASS notice.
 */
export async function recordPass(
  page: Page,
  serial: string,
  countersigner?: DemoRole,
): Promise<void> {
  await expect
    .poll(() => page.locator('[data-test="verdict"]').getAttribute('data-verdict'))
    .toBe('pass')
  await page.locator('[data-test="record"]').click()
  if (countersigner) {
    const dialog = page.getByRole('dialog', { name: 'Second person signs' })
    await dialog.getByLabel('E-mail').fill(demoEmail(countersigner))
    await dialog.getByLabel('Password').fill(DEMO_PASSWORD)
    await dialog.getByRole('button', { name: 'Sign and record' }).click()
  }
  const notice = page.locator('[data-test="floor-notice"]')
  await expect.poll(() => notice.textContent()).toContain(`PASS · ${serial}`)
}
