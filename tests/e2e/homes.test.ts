import type { Page } from 'playwright-core'
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { areasForRole } from '../../shared/areas'
import { db } from '../../server/models'
import type { DemoRole } from './support/setup'
import { openPage, picturesOf, signInAs, signInByApi, useE2eApp } from './support/setup'

/** Where each role lands after signing in (issue 19), with no redirect asked for. */
const HOMES: Record<DemoRole, string> = {
  operator: '/floor',
  lead: '/yield',
  engineer: '/recipes',
  stores: '/receiving',
  service: '/trace',
  admin: '/admin/status',
}

/** Signs out through the bar; the tabs of one browser share the session cookie. */
async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out' }).click()
  await page.waitForURL((url) => url.pathname === '/signin')
}

/** A seeded unit that has been through at least one step. */
async function someSerial(): Promise<string> {
  const [row] = await db().query<{ serial: string }>(
    `SELECT u.serial FROM units u WHERE EXISTS (SELECT 1 FROM step_runs sr WHERE sr.unit_id = u.id)
     ORDER BY u.serial LIMIT 1`,
    { type: QueryTypes.SELECT },
  )
  if (!row) throw new Error('the seed has no unit with a step run')
  return row.serial
}

describe('A home for each role, and the search box', () => {
  const e2e = useE2eApp()

  it('lands each role on its home, with its own areas in the order of its work', async () => {
    for (const role of Object.keys(HOMES) as DemoRole[]) {
      const page = await openPage(e2e, `home-${role}`)
      await signInAs(e2e, page, role)
      await page.waitForURL((url) => url.pathname === HOMES[role])
      const nav = page.getByRole('navigation', { name: 'Areas' })
      await nav.waitFor()
      const labels = (await nav.getByRole('link').allTextContents()).map((t) => t.trim())
      expect(labels, role).toEqual(areasForRole(role).map((a) => a.label))
      await signOut(page)
      await page.close()
    }
  })

  it('takes an operator back to the station this device used last', async () => {
    const page = await openPage(e2e, 'home-operator-station')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    const [station] = await db().query<{ code: string }>(
      `SELECT code FROM stations WHERE is_active ORDER BY code LIMIT 1`,
      { type: QueryTypes.SELECT },
    )
    await page.evaluate(
      (code) => localStorage.setItem('waymark.floor.station', code),
      station!.code,
    )
    await signInAs(e2e, page, 'operator')
    await page.waitForURL((url) => url.pathname === `/floor/${station!.code}`)
    await page.evaluate(() => localStorage.removeItem('waymark.floor.station'))
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL((url) => url.pathname === '/signin')
    await page.close()
  })

  it('keeps an explicit redirect after sign-in over the home', async () => {
    const page = await openPage(e2e, 'home-redirect')
    await signInAs(e2e, page, 'lead', '/shipping')
    await page.waitForURL((url) => url.pathname === '/shipping')
    expect(new URL(page.url()).pathname).toBe('/shipping')
    await signOut(page)
    await page.close()
  })

  it("focuses the search on '/', and Enter opens a serial's trace", async () => {
    const serial = await someSerial()
    const page = await openPage(e2e, 'search-serial')
    const picture = picturesOf(page)
    await page.goto(`${e2e.app.baseUrl}/signin`)
    await signInByApi(page, 'service')
    await page.goto(`${e2e.app.baseUrl}/customers`)
    await page.getByRole('heading', { name: 'Customers' }).click()

    // In a field, '/' is a character like any other.
    const filter = page.getByPlaceholder('Find by name, e-mail or address')
    await filter.click()
    await page.keyboard.type('a/b')
    expect(await filter.inputValue()).toBe('a/b')
    await page.getByRole('heading', { name: 'Customers' }).click()

    await page.keyboard.press('/')
    const box = page.getByRole('combobox', { name: 'Search Waymark' })
    await expect.poll(() => box.evaluate((el) => el === document.activeElement)).toBe(true)
    // Typed without its check character: the unit is still found, and the hit says why.
    await page.keyboard.type(serial.slice(0, -1))
    const hit = page.locator('[role=option][data-kind=unit]').first()
    await hit.waitFor()
    expect(await hit.textContent()).toContain(serial)
    expect(await hit.textContent()).toContain('check character added')
    await picture('search-serial')
    await page.keyboard.press('Enter')
    await page.waitForURL((url) => url.pathname === '/trace')
    expect(new URL(page.url()).searchParams.get('serial')).toBe(serial)
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)

    // Arrow keys move through the hits; Enter opens the one chosen.
    const [lot] = await db().query<{ number: string }>(
      'SELECT number FROM lots ORDER BY number LIMIT 1',
      { type: QueryTypes.SELECT },
    )
    await page.getByRole('heading', { level: 1 }).first().click()
    await page.keyboard.press('/')
    await page.keyboard.type(lot!.number)
    await page.locator('[role=group][aria-label=Lots] [role=option]').first().waitFor()
    await picture('search-lot')
    for (let i = 0; i < 30; i++) {
      const selected = page.locator('[role=option][aria-selected=true]')
      if ((await selected.getAttribute('data-kind')) === 'lot') break
      await page.keyboard.press('ArrowDown')
    }
    const chosen = page.locator('[role=option][aria-selected=true]')
    expect(await chosen.getAttribute('data-kind')).toBe('lot')
    expect(await chosen.locator('.global-search__title').textContent()).toBe(lot!.number)
    await page.keyboard.press('Enter')
    await page.waitForURL((url) => url.pathname.startsWith('/lots/'))
    await expect.poll(() => page.getByText(lot!.number).first().isVisible()).toBe(true)
    await signOut(page)
    await page.close()
  })

  it('shows the admin the status page: services, queues, failed e-mails, users', async () => {
    const page = await openPage(e2e, 'status-page')
    const picture = picturesOf(page, true)
    await signInAs(e2e, page, 'admin')
    await page.waitForURL((url) => url.pathname === '/admin/status')
    const services = page.getByRole('list', { name: 'Services' })
    await services.waitFor()
    expect(await services.locator('[data-service=postgres]').textContent()).toContain('Answering')
    expect(await page.locator('[data-queue]').count()).toBe(4)
    expect(await page.getByRole('heading', { name: 'Users' }).isVisible()).toBe(true)
    await picture('status-page')
    await signOut(page)
    await page.close()
  })
})
