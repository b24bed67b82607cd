import type { Worker } from 'bullmq'
import type { Redis } from 'ioredis'
import { describe, expect, it } from 'vitest'
import { closeImportsQueue } from '../../server/services/imports/queue'
import { newQueueConnection } from '../../server/redis'
import { startImportsWorker } from '../../server/services/imports'
import { resetSignInLimits, signedInAs } from '../api/support/client'
import { releasedTestLot, windingRun } from '../api/support/floor'
import { openPage, picturesOf, signInAs, useE2eApp } from './support/setup'

describe('Bench import screen', () => {
  let connection: Redis
  let worker: { worker: Worker; stop: () => void }
  const e2e = useE2eApp({
    // The import job needs a worker; the app server runs none, so one runs in this process.
    before: async () => {
      connection = newQueueConnection()
      worker = startImportsWorker(connection)
    },
    after: async () => {
      worker?.stop()
      await worker?.worker.close()
      await connection?.quit()
      await closeImportsQueue()
    },
  })

  it('uploads a rack file, shows the dry run with its problems in words, imports and shows progress', async () => {
    await resetSignInLimits()
    const [engineer, lead, stores, operator] = await Promise.all(
      ['engineer', 'lead', 'stores', 'operator'].map(signedInAs),
    )
    const t = await releasedTestLot({ engineer, lead, stores }, 3, 10)
    for (const u of t.units.slice(0, 2))
      await operator.post('/api/step-runs', windingRun(t, u.serial)).expect(201)
    const [a, b, c] = t.units.map((u) => u.serial)
    const file = [
      'Serial,Tested at,Operator,Vout (V)',
      `${a},2026-12-02 09:00,jmarsh,350.3`,
      `${b},2026-12-02 09:05,jmarsh,342.0`,
      `${c},2026-12-02 09:10,jmarsh,350.0`,
      `NOPE-1,2026-12-02 09:15,jmarsh,350.0`,
    ].join('\n')

    const page = await openPage(e2e, 'import')
    const picture = picturesOf(page, true)

    await signInAs(e2e, page, 'engineer')
    await page.goto(`${e2e.app.baseUrl}/import`)
    await page.locator('[data-test="import-station"]').click()
    await page.getByRole('option', { name: /^LDT-1 · / }).click()
    await expect.poll(() => page.locator('[data-test="hv-caution"]').count()).toBe(1)
    await page
      .locator('[data-test="import-drop"] input[type="file"]')
      .setInputFiles({ name: 'rack-ldt1.csv', mimeType: 'text/csv', buffer: Buffer.from(file) })
    await page.locator('[data-test="import-current"]').waitFor()
    expect(await page.locator('[data-test="map-serial"]').innerText()).toContain('Serial')
    await picture('import-mapping')

    await page.locator('[data-test="import-check"]').click()
    const counts = page.locator('[data-test="import-counts"]')
    await counts.waitFor()
    expect(await counts.innerText()).toMatch(/Can be imported\s+2/)
    const table = page.locator('[data-test="import-rows"]')
    await expect.poll(() => table.innerText()).toContain('Not imported:')
    const text = await table.innerText()
    expect(text).toContain(`${c} is waiting for Winding; this is Load-test rack 1`)
    expect(text).toContain('no unit NOPE-1: check the traveler')
    await picture('import-dry-run')

    await page.getByRole('radio', { name: 'All rows' }).click({ force: true })
    await page.locator('[data-test="import-defect"]').click()
    await page.getByRole('option', { name: /^L-VOUT · / }).click()
    await page.locator('[data-test="import-run"]').click()
    const progress = page.locator('[data-test="import-progress"]')
    await progress.waitFor()
    await expect.poll(() => progress.getAttribute('data-status')).toBe('done')
    await expect.poll(() => counts.innerText()).toMatch(/Recorded\s+2/)
    await expect.poll(() => table.innerText()).toContain('Recorded:')
    await picture('import-done')
    await page.close()
  })
})
