import { beforeAll, describe, expect, it } from 'vitest'
import type { CustomerDto, ServiceCaseDto } from '../../shared/schemas/shipping'
import { AuditEvent, ComponentLot, Document, Lot, ServiceCase, Unit } from '../../server/models'
import { resetSignInLimits, signedInAs, uniqueSuffix } from '../api/support/client'
import type { TestClient } from '../api/support/client'
import { loadTestRun, releasedTestLot, windingRun } from '../api/support/floor'
import type { TestLot } from '../api/support/floor'
import { openPage, picturesOf, signInByApi, signInHere, useE2eApp } from './support/setup'

const stateOf = async (serial: string) => (await Unit.findOne({ where: { serial } }))!.state

describe('component lot links, a unit’s papers, returns, packing and containment', () => {
  const e2e = useE2eApp()
  // A lot of its own, built for a customer of its own, so the demo stays as other tests expect.
  let t: TestLot
  let lead: TestClient
  let customer: CustomerDto
  /** Shipped and returned (open case). */
  let returned: string
  /** Shipped, not returned. */
  let shipped: string
  /** Wound only: still in the shop. */
  let inShop: string
  /** Passed, waiting to be packed. */
  let toPack: string
  let caseNumber: string

  beforeAll(async () => {
    await resetSignInLimits()
    const [engineer, stores, operator, service] = await Promise.all(
      ['engineer', 'stores', 'operator', 'service'].map(signedInAs),
    )
    lead = await signedInAs('lead')
    t = await releasedTestLot({ engineer, lead, stores }, 4)
    ;[returned, shipped, inShop, toPack] = t.units.map((u) => u.serial) as [
      string,
      string,
      string,
      string,
    ]
    for (const s of [returned, shipped, inShop, toPack])
      await operator.post('/api/step-runs', windingRun(t, s)).expect(201)
    for (const s of [returned, shipped, toPack])
      await operator.post('/api/step-runs', loadTestRun(s, 350.4)).expect(201)
    customer = (
      await lead
        .post('/api/customers', {
          name: `Corran Pumps ${uniqueSuffix()}`,
          contactEmail: `orders.${uniqueSuffix()}@corran.example`,
        })
        .expect(201)
    ).body as CustomerDto
    // Test setup only: the lot was built for this customer.
    await Lot.update({ customerId: customer.id }, { where: { id: t.lot.id } })
    await lead
      .post('/api/shipments', {
        customerId: customer.id,
        shippedOn: '2026-12-02',
        serials: [returned, shipped],
      })
      .expect(201)
    caseNumber = (
      (
        await service
          .post('/api/service-cases', {
            serial: returned,
            complaint: 'no output after a week',
            receivedOn: '2026-12-04',
          })
          .expect(201)
      ).body as ServiceCaseDto
    ).number
  })

  it('opens a component lot label’s link for each role, signing in first when needed', async () => {
    const code = t.componentLotCode
    const page = await openPage(e2e, 'lot-link-stores')
    await page.goto(`${e2e.app.baseUrl}/c/${code.toLowerCase()}`)
    await page.waitForURL(/\/signin\?next=/)
    await signInHere(page, 'stores')
    await page.waitForURL((url) => url.pathname === '/receiving' && url.search.includes(code))
    await page.locator('.el-table__row', { hasText: code }).first().waitFor()
    await picturesOf(page)('lot-link-stores')
    await page.close()

    const leadPage = await openPage(e2e, 'lot-link-lead')
    await leadPage.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(leadPage, 'lead')
    await leadPage.goto(`${e2e.app.baseUrl}/c/${code}`)
    await leadPage.waitForURL(/\/trace\?lot=/)
    await expect.poll(() => leadPage.locator('[data-test=recall-code]').textContent()).toBe(code)
    await leadPage.close()

    const bench = await openPage(e2e, 'lot-link-operator')
    await bench.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(bench, 'operator')
    await bench.goto(`${e2e.app.baseUrl}/c/${code}`)
    await expect.poll(() => bench.locator('[data-test=lot-link-code]').textContent()).toBe(code)
    await bench.close()
  })

  it('shows one documents panel and asks before certifying a unit with an open return', async () => {
    const page = await openPage(e2e, 'unit-documents')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'service')
    await page.goto(`${e2e.app.baseUrl}/trace?serial=${returned}`)
    const panel = page.locator('[data-test=unit-documents]')
    // The shipment's packing slip shows in the unit's one panel; no second list beside it.
    await panel.locator('[data-kind=packing_slip]').waitFor()
    expect(await page.locator('section[aria-label=Documents]').count()).toBe(0)
    expect(await page.locator('[data-test=unit-documents]').count()).toBe(1)

    const unitId = (await Unit.findOne({ where: { serial: returned } }))!.id
    const certificates = () => Document.count({ where: { kind: 'certificate', unitId } })
    await panel.locator('[data-test=make-certificate]').click()
    const box = page.locator('.el-message-box')
    await box.getByText(`Unit ${returned} has open return ${caseNumber}; issue anyway?`).waitFor()
    await picturesOf(page)('unit-documents-open-return')
    await box.getByRole('button', { name: 'Cancel' }).click()
    await box.waitFor({ state: 'hidden' })
    expect(await certificates()).toBe(0)
    await panel.locator('[data-test=make-certificate]').click()
    await box.getByRole('button', { name: 'Issue anyway' }).click()
    await panel.locator('[data-kind=certificate]').waitFor()
    expect(await certificates()).toBe(1)

    // The Service case shows the same panel with the same papers.
    const caseId = (await ServiceCase.findOne({ where: { number: caseNumber } }))!.id
    await page.goto(`${e2e.app.baseUrl}/service?open=${caseId}`)
    const drawerPanel = page.locator('.el-drawer [data-test=unit-documents]')
    await drawerPanel.locator('[data-kind=certificate]').waitFor()
    await drawerPanel.locator('[data-kind=packing_slip]').waitFor()
    await picturesOf(page)('service-case-documents')
    await page.close()
  })

  it('shows the unit, product and customer of a serial before a return is logged', async () => {
    const page = await openPage(e2e, 'return-dialog')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'service')
    await page.goto(`${e2e.app.baseUrl}/service`)
    await page.getByRole('button', { name: 'Log a return' }).click()
    const dialog = page.getByRole('dialog', { name: 'Log a return' })
    const logButton = dialog.locator('[data-test=log-return]')
    const serialBox = dialog.locator('[data-test=return-serial]')

    await serialBox.fill(inShop)
    await dialog.getByText('No return can be logged').waitFor()
    expect(await logButton.isDisabled()).toBe(true)

    await serialBox.fill(shipped)
    const preview = dialog.locator('[data-test=return-preview]')
    await preview.getByText(customer.name).waitFor()
    expect(await preview.textContent()).toContain(t.lot.productCode)
    expect(await logButton.isDisabled()).toBe(false)
    await dialog.locator('textarea').fill('hums loudly')
    await picturesOf(page)('return-dialog-preview')
    await logButton.click()
    await expect.poll(() => stateOf(shipped)).toBe('returned')
    await page.close()
  })

  it('pre-fills the lot’s customer when packing and asks before shipping', async () => {
    const page = await openPage(e2e, 'shipping-confirm')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'lead')
    await page.goto(`${e2e.app.baseUrl}/shipping`)
    const scan = page.locator('[data-test=ship-scan]')
    await scan.fill(toPack)
    await scan.press('Enter')
    await page.locator('[data-test=ship-count]').getByText('1').waitFor()
    await expect
      .poll(() => page.locator('[data-test=ship-customer]').textContent())
      .toContain(customer.name)

    await page.locator('[data-test=ship-confirm]').click()
    const box = page.locator('.el-message-box')
    await box.getByText(`1 unit goes to ${customer.name}`, { exact: false }).waitFor()
    await picturesOf(page)('shipping-confirm')
    await box.getByRole('button', { name: 'Cancel' }).click()
    await box.waitFor({ state: 'hidden' })
    expect(await stateOf(toPack)).toBe('passed')
    await page.locator('[data-test=ship-confirm]').click()
    await box.getByRole('button', { name: 'Ship', exact: true }).click()
    await expect.poll(() => stateOf(toPack)).toBe('shipped')
    await page.close()
  })

  it('contains the lot from its recall scope in one confirmed action, no column clipped', async () => {
    const code = t.componentLotCode
    const page = await openPage(e2e, 'recall-contain')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'lead')
    await page.goto(`${e2e.app.baseUrl}/trace?lot=${code}`)
    await page.locator('[data-test=recall-code]').waitFor()
    await page.locator('.rscope__units .el-table__row').first().waitFor()
    // Every cell of the units table shows its whole text inside the card: none is cut at its
    // column's edge, and the table needs no sideways scrolling to show a column.
    const clipped = await page.evaluate(() => {
      const card = document.querySelector('.rscope__units')!.getBoundingClientRect()
      const cells = Array.from(
        document.querySelectorAll<HTMLElement>('.rscope__units .el-table .cell'),
      )
      const wrap = document.querySelector<HTMLElement>('.rscope__units .el-scrollbar__wrap')!
      return [
        ...cells
          .filter(
            (c) =>
              c.scrollWidth > c.clientWidth + 1 || c.getBoundingClientRect().right > card.right,
          )
          .map((c) => c.textContent?.trim()),
        ...(wrap.scrollWidth > wrap.clientWidth + 1 ? ['the table scrolls sideways'] : []),
      ]
    })
    expect(clipped).toEqual([])
    await picturesOf(page)('recall-scope')

    await page.locator('[data-test=contain]').click()
    await page.locator('#contain-reason').fill('supplier reports cracked cores in this batch')
    await page.locator('[data-test=contain-confirm]').click()
    await page.getByRole('status').filter({ hasText: 'Contained:' }).waitFor()
    const lot = (await ComponentLot.findOne({ where: { internalCode: code } }))!
    expect(lot.status).toBe('quarantined')
    expect(await stateOf(inShop)).toBe('on_hold')
    expect(await stateOf(toPack)).toBe('shipped') // gone: the customer is told, not held
    expect(
      await AuditEvent.count({ where: { action: 'component_lot.contain', entityId: lot.id } }),
    ).toBe(1)
    await picturesOf(page)('recall-contained')
    await page.close()
  })
})
