import type { Page } from 'playwright-core'
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { areasForRole } from '../../shared/areas'
import { db } from '../../server/models'
import { openPage, picturesOf, signInAs, signInHere, useE2eApp } from './support/setup'

/** A seeded unit with the most step runs, so its history has several steps to fold. */
async function unitWithHistory(): Promise<string> {
  const [row] = await db().query<{ serial: string }>(
    `SELECT u.serial FROM units u JOIN step_runs sr ON sr.unit_id = u.id
     GROUP BY u.serial ORDER BY count(DISTINCT sr.step_id) DESC, count(*) DESC, u.serial LIMIT 1`,
    { type: QueryTypes.SELECT },
  )
  if (!row) throw new Error('the seed has no unit with a step run')
  return row.serial
}

/** How far the page reaches past the window's right edge (0 when nothing scrolls sideways). */
const sidewaysOverflow = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)

/** The top of an element on the page, in CSS pixels. */
async function topOf(page: Page, selector: string): Promise<number> {
  const box = await page.locator(selector).first().boundingBox()
  if (!box) throw new Error(`${selector} is not shown`)
  return box.y
}

describe('A phone at a traveler, and a navigation that fits', () => {
  const e2e = useE2eApp()

  it('opens a scanned unit at 390×844 through sign-in, summary and papers first', async () => {
    const serial = await unitWithHistory()
    const page = await openPage(e2e, 'phone-trace')
    await page.setViewportSize({ width: 390, height: 844 })
    await page.context().clearCookies()
    const picture = picturesOf(page)

    // Only a unit's link names a unit; another page, or text that is no serial, does not.
    for (const next of ['/lots', '/u/%3Cb%3Ehello%3C%2Fb%3E']) {
      await page.goto(`${e2e.app.baseUrl}/signin?next=${encodeURIComponent(next)}`)
      await page.locator('input[name="email"]').waitFor()
      expect(await page.locator('[data-test=scanned-unit]').count(), next).toBe(0)
    }

    // Signed out, the traveler's QR lands on the sign-in page, which names the unit.
    await page.goto(`${e2e.app.baseUrl}/u/${serial}`)
    await page.waitForURL((url) => url.pathname === '/signin')
    const scanned = page.locator('[data-test=scanned-unit]')
    await scanned.waitFor()
    expect((await scanned.textContent())?.replace(/\s+/g, ' ').trim()).toBe(
      `Scanned unit ${serial}: sign in to see it.`,
    )
    expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0)
    await picture('phone-signin')

    // Signing in returns to the unit: customer service sees its trace.
    await signInHere(page, 'service')
    await page.waitForURL((url) => url.pathname === '/trace')
    expect(new URL(page.url()).searchParams.get('serial')).toBe(serial)
    await expect.poll(() => page.locator('[data-test=trace-serial]').textContent()).toBe(serial)
    expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0)

    // The areas hide behind the menu button; it opens them, each as a link.
    expect(await page.getByRole('navigation', { name: 'Areas' }).isVisible()).toBe(false)
    await page.locator('[data-test=menu-button]').click()
    const menu = page.getByRole('navigation', { name: 'Menu' })
    await menu.waitFor()
    const labels = (await menu.getByRole('link').allTextContents()).map((t) => t.trim())
    expect(labels).toEqual(areasForRole('service').map((a) => a.label))
    expect(await page.getByRole('button', { name: 'Sign out' }).isVisible()).toBe(true)
    await expect.poll(() => menu.boundingBox().then((b) => b && b.x >= 0)).toBe(true)
    await picture('phone-menu')
    await page.getByRole('button', { name: 'Close the menu' }).click()
    await menu.waitFor({ state: 'hidden' })

    // Summary, then the unit's papers, then the history, folded one line per step.
    const summary = await topOf(page, '[aria-label="Unit summary"]')
    const documents = await topOf(page, '[data-test="unit-documents"]')
    const papers = await topOf(page, 'section[aria-label="Returns"]')
    const history = await topOf(page, 'h2:has-text("History, step by step")')
    expect(summary).toBeLessThan(documents)
    expect(documents).toBeLessThan(history)
    expect(papers).toBeLessThan(history)
    const steps = page.locator('details.tstep')
    expect(await steps.count()).toBeGreaterThan(1)
    expect(
      await steps.evaluateAll((all) => all.filter((d) => (d as HTMLDetailsElement).open)),
    ).toHaveLength(0)
    expect(await page.locator('.trun').first().isVisible()).toBe(false)
    await picture('phone-trace')

    // A tap on a step unfolds its runs, whose readings still fit the width.
    const first = steps.first()
    await first.locator('summary').click()
    await first.locator('.trun').first().waitFor()
    expect(await steps.nth(1).locator('.trun').first().isVisible()).toBe(false)
    expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0)
    await first.scrollIntoViewIfNeeded()
    await picture('phone-trace-step')
    await picturesOf(page, true)('phone-trace-whole')
    await page.close()
  })

  it('shows every area of the admin inside the window from 1280 to 1920 px, then a menu', async () => {
    const page = await openPage(e2e, 'wide-navigation')
    await page.setViewportSize({ width: 1440, height: 900 })
    await page.context().clearCookies()
    await signInAs(e2e, page, 'admin')
    await page.waitForURL((url) => url.pathname === '/admin/status')
    const nav = page.getByRole('navigation', { name: 'Areas' })
    await nav.waitFor()
    const expected = areasForRole('admin').map((a) => a.label)

    for (const width of [1440, 1280, 1920]) {
      await page.setViewportSize({ width, height: 900 })
      const links = nav.getByRole('link')
      expect(
        (await links.allTextContents()).map((t) => t.trim()),
        `${width}`,
      ).toEqual(expected)
      for (const link of await links.all()) {
        const box = await link.boundingBox()
        expect(box, `${await link.textContent()} at ${width}`).not.toBeNull()
        expect(box!.x, `${await link.textContent()} at ${width}`).toBeGreaterThanOrEqual(0)
        expect(box!.x + box!.width, `${await link.textContent()} at ${width}`).toBeLessThanOrEqual(
          width,
        )
        expect(box!.y + box!.height).toBeLessThanOrEqual(900)
      }
      // Nothing is hidden past the row's end either, and the page itself does not scroll sideways.
      expect(await nav.evaluate((n) => n.scrollWidth - n.clientWidth), `${width}`).toBe(0)
      expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0)
      expect(await page.locator('[data-test=menu-button]').isVisible()).toBe(false)
      await picturesOf(page)(`wide-navigation-${width}`)
    }

    // Below the breakpoint (a tablet on its side) the same areas wait behind the menu button.
    await page.setViewportSize({ width: 1024, height: 768 })
    expect(await nav.isVisible()).toBe(false)
    await page.locator('[data-test=menu-button]').click()
    const menu = page.getByRole('navigation', { name: 'Menu' })
    await menu.waitFor()
    expect((await menu.getByRole('link').allTextContents()).map((t) => t.trim())).toEqual(expected)
    expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0)
    await picturesOf(page)('narrow-navigation-1024')
    // Taking an area closes the menu on that area's page.
    await menu.getByRole('link', { name: 'Users' }).click()
    await page.waitForURL((url) => url.pathname === '/admin/users')
    await menu.waitFor({ state: 'hidden' })
    await page.close()
  })
})
