import { randomBytes } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { signInThroughForm } from './support/browser'
import { openPage, signInHere, useE2eApp } from './support/setup'

describe('Sign-in', () => {
  const e2e = useE2eApp()

  it('says so when the password is wrong, and stays on the sign-in page', async () => {
    const page = await openPage(e2e, 'signin-wrong-password')
    await page.goto(`${e2e.app.baseUrl}/signin`)
    // NOTE: failed sign-ins are rate limited per account for 15 minutes. A fresh address each
    // run keeps repeated runs from locking out the demo accounts the other tests sign in with;
    // the server answers an unknown account and a wrong password alike, on purpose.
    const email = `nobody-${randomBytes(3).toString('hex')}@ferncastle.example`
    await signInThroughForm(page, email, 'not-the-password')
    const alert = page.getByRole('alert')
    await alert.waitFor()
    expect(await alert.textContent()).toContain('do not match an active account')
    expect(new URL(page.url()).pathname).toBe('/signin')
    await page.close()
  })

  it('shows an operator only the areas of their role, and Sign out ends the session', async () => {
    const page = await openPage(e2e, 'signin-operator')
    await page.goto(`${e2e.app.baseUrl}/`)
    await page.waitForURL(/\/signin/)
    await signInHere(page, 'operator')
    const nav = page.getByRole('navigation', { name: 'Areas' })
    await nav.waitFor({ state: 'attached' })
    expect(await nav.textContent()).not.toContain('Users')
    expect(await page.locator('a[href="/admin/users"]').count()).toBe(0)

    // Typing the address does not help either: the guard sends the operator to their first
    // area, the Floor's station picker.
    await page.goto(`${e2e.app.baseUrl}/admin/users`)
    await page.waitForURL(/\/floor$/)
    expect(new URL(page.url()).pathname).toBe('/floor')

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    await page.goto(`${e2e.app.baseUrl}/`)
    await page.waitForURL(/\/signin/)
    await page.close()
  })

  it('signs out from a data screen without an error left behind', async () => {
    const page = await openPage(e2e, 'signin-sign-out')
    await page.goto(`${e2e.app.baseUrl}/admin/stations`)
    await signInHere(page, 'lead')
    await page.locator('.el-table__row').first().waitFor()
    // A lead may look at stations but not change them.
    expect(await page.getByRole('button', { name: 'New station' }).count()).toBe(0)

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    // Any request the old screen still had open has answered by the time the network is quiet.
    await page.waitForLoadState('networkidle')
    expect(await page.locator('.el-message--error').count()).toBe(0)
    await page.close()
  })
})
