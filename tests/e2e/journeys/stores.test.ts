import { describe, expect, it } from 'vitest'
import type { ComponentLotDto } from '../../../shared/schemas/componentLots'
import { uniqueSuffix } from '../../api/support/client'
import {
  DEMO_ROUTE,
  linesAt,
  revisionsWithRoute,
  stationOf,
  unitWaitingAtStart,
} from '../support/demo'
import { scanTraveler } from '../support/floorDriver'
import {
  callApi,
  openPageSignedIn,
  signInAs,
  signInByApi,
  signInHere,
  useE2eApp,
} from '../support/setup'

describe('Stores journey', () => {
  const e2e = useE2eApp()

  it('quarantines a component lot in Receiving, and the Floor refuses to fit it', async () => {
    // Set-up through the API: a unit waiting at winding (as the lead), and a delivery of the
    // part fitted first there, received by stores, so no other test fits from this lot.
    const page = await openPageSignedIn(e2e, 'journey-stores', 'lead')
    const revision = (await revisionsWithRoute(page, DEMO_ROUTE)).find(
      (r) => r.steps[0]!.stationKind === 'winding' && linesAt(r, r.steps[0]!).length > 0,
    )
    expect(revision, 'a released demo revision that fits parts at winding').toBeTruthy()
    const line = linesAt(revision!, revision!.steps[0]!)[0]!
    const { serial } = await unitWaitingAtStart(page, revision!, 'Journey: stores')
    const station = await stationOf(page, 'winding')
    await callApi(page, '/auth/logout', 'POST')
    await signInByApi(page, 'stores')
    const delivery = await callApi<ComponentLotDto>(page, '/component-lots', 'POST', {
      partId: line.partId,
      supplierName: 'Journey Ferrites',
      supplierLotCode: `JF-${uniqueSuffix()}`,
      quantityReceived: 50,
      receivedOn: new Date().toISOString().slice(0, 10),
    })
    await callApi(page, '/auth/logout', 'POST')

    // Stores finds the lot in Receiving by its code and quarantines it, saying why.
    await signInAs(e2e, page, 'stores', '/receiving')
    await page.waitForURL(/\/receiving$/)
    await page.getByPlaceholder('Lot code, supplier or their lot code').fill(delivery.internalCode)
    await page.getByRole('button', { name: 'Search', exact: true }).click()
    const row = page.locator('.el-table__row', { hasText: delivery.internalCode })
    await expect.poll(() => page.locator('.el-table__row').count()).toBe(1)
    await row.getByTitle(`Change the status of ${delivery.internalCode}`).click()
    const dialog = page.getByRole('dialog', { name: `Status of lot ${delivery.internalCode}` })
    await dialog.getByRole('radio', { name: /Quarantined/ }).check({ force: true })
    await dialog.getByRole('textbox').fill('Supplier notice: cores of this batch may be cracked')
    await dialog.getByRole('button', { name: 'Change status' }).click()
    await page.getByRole('button', { name: 'Mark quarantined' }).click()
    await expect.poll(() => row.textContent()).toContain('Quarantined')
    const saved = await callApi<ComponentLotDto>(page, `/component-lots/${delivery.id}`)
    expect(saved.status).toBe('quarantined')
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)

    // At the winding bench the operator scans the quarantined lot's label: refused, in words.
    await page.goto(`${e2e.app.baseUrl}/floor/${station}`)
    await page.waitForURL(/\/signin\?next=/)
    await signInHere(page, 'operator')
    await scanTraveler(page, serial)
    const field = page.locator(`[data-field="lot:${line.id}"]`)
    await field.fill(delivery.internalCode)
    await field.press('Enter')
    const refused = page.locator(`.material--refused[data-line="${line.id}"]`)
    await refused.waitFor()
    expect(await refused.locator('[role="alert"]').textContent()).toMatch(/quarantin/i)
    expect(await page.locator('[data-test="verdict"]').getAttribute('data-verdict')).not.toBe(
      'pass',
    )
    await page.close()
  })
})
