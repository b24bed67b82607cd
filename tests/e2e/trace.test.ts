import { readFileSync } from 'node:fs'
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { db } from '../../server/models'
import { openPage, openPageSignedIn, picturesOf, signInByApi, useE2eApp } from './support/setup'

/** The seeded unit with the richest history: a nonconformance if any, then the most runs. */
async function busiestSerial(): Promise<string> {
  const [row] = await db().query<{ serial: string }>(
    `SELECT u.serial FROM units u
     JOIN step_runs sr ON sr.unit_id = u.id
     LEFT JOIN nonconformances nc ON nc.unit_id = u.id
     GROUP BY u.serial
     ORDER BY count(DISTINCT nc.id) DESC, count(DISTINCT sr.id) DESC, u.serial
     LIMIT 1`,
    { type: QueryTypes.SELECT },
  )
  if (!row) throw new Error('the seed has no unit with a step run')
  return row.serial
}

describe('Trace for customer service', () => {
  const e2e = useE2eApp()

  it('finds a serial typed at the keyboard, corrects a mistyped one and downloads the PDF', async () => {
    const serial = await busiestSerial()
    const page = await openPage(e2e, 'trace')
    const picture = picturesOf(page)

    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'service')
    await page.goto(`${e2e.app.baseUrl}/trace`)
    // The scan box has the focus on arrival: a wedge scanner (or a person) just types.
    await page.waitForFunction(
      () => document.activeElement?.getAttribute('data-field') === 'trace-scan',
    )
    await page.keyboard.type(serial.toLowerCase())
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)
    expect(await page.getByText('History, step by step').isVisible()).toBe(true)
    expect(await page.locator('.trun').count()).toBeGreaterThan(0)
    await picture('trace-unit')

    // A slip on the check character: the page says so and offers the real serial.
    const wrong = serial.slice(0, -1) + (serial.endsWith('A') ? 'B' : 'A')
    await page.locator('[data-field=trace-scan]').focus()
    await page.keyboard.type(wrong)
    await page.keyboard.press('Enter')
    const notice = page.locator('[data-test=trace-miss]')
    await notice.waitFor()
    expect(await notice.textContent()).toContain('was mistyped')
    await picture('trace-mistyped')
    const first = page.locator('[data-test=suggestion]').first()
    expect((await first.textContent())?.trim()).toBe(serial)
    await first.focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.locator('[data-test=history-pdf]').click(),
    ])
    expect(download.suggestedFilename()).toBe(`unit-history-${serial}.pdf`)
    const file = await download.path()
    expect(readFileSync(file).subarray(0, 5).toString()).toBe('%PDF-')

    // From a component lot the unit holds, the recall scope of every unit sharing it.
    const chip = page.locator('.tsum__lot').first()
    if (await chip.count()) {
      await chip.click()
      await page.locator('[data-test=recall-code]').waitFor()
      expect(await page.locator('[data-test=contain]').count()).toBe(0) // leads only
      await picture('trace-recall')
    }

    // The traveler's QR link opens the same trace for service.
    await page.goto(`${e2e.app.baseUrl}/u/${serial}`)
    await page.waitForURL(/\/trace\?serial=/)
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)
    await page.close()
  })

  it('offers a lead the Contain action with a reason, and cancels without changing anything', async () => {
    const [row] = await db().query<{ code: string }>(
      `SELECT cl.internal_code AS code FROM component_lots cl
       JOIN consumptions co ON co.component_lot_id = cl.id
       GROUP BY cl.internal_code ORDER BY count(*) DESC LIMIT 1`,
      { type: QueryTypes.SELECT },
    )
    const page = await openPageSignedIn(e2e, 'trace-contain', 'lead')
    await page.goto(`${e2e.app.baseUrl}/trace?lot=${row!.code}`)
    await page.locator('[data-test=recall-code]').waitFor()
    await page.locator('[data-test=contain]').click()
    const confirm = page.locator('[data-test=contain-confirm]')
    await confirm.waitFor()
    expect(await confirm.isDisabled()).toBe(true) // no reason yet
    await page.locator('#contain-reason').fill('supplier reports cracked cores in this batch')
    expect(await confirm.isDisabled()).toBe(false)
    await picturesOf(page)('trace-contain-dialog')
    await page.getByRole('button', { name: 'Cancel' }).click()
    const [still] = await db().query<{ status: string }>(
      'SELECT status FROM component_lots WHERE internal_code = :code',
      { replacements: row, type: QueryTypes.SELECT },
    )
    expect(still!.status).toBe('available')
    await page.close()
  })
})
