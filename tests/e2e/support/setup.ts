import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll } from 'vitest'
import { startAppServer } from './appServer'
import type { AppServer } from './appServer'
import { E2E_RESULTS_DIR, launchBrowser, screenshotOnFailure, signInThroughForm } from './browser'
import type { TestBrowser } from './browser'
export { waitForStillness } from './browser'

/** The password of every user the demo seed makes. */
export const DEMO_PASSWORD = 'waymark-demo'

/** Roles the demo seed has a user for. */
export type DemoRole = 'admin' | 'engineer' | 'lead' | 'operator' | 'stores' | 'service'

/** The demo seed's user for a role, e.g. `lead@ferncastle.example`. */
export const demoEmail = (role: DemoRole) => `${role}@ferncastle.example`

/** The app and the browser of one describe block; filled in before its first test. */
export interface E2eContext {
  app: AppServer
  browser: TestBrowser
}

/**
 * Starts the app in this process and a headless Chromium before the enclosing describe's tests,
 * and closes both after them. Call it inside `describe`.
 * @param hooks `before` runs first (e.g. workers, fakes, data the tests need); `after` runs
 *   once the browser is closed and before the app closes; vitest's hookTimeout (from
 *   support/timeouts.ts) bounds them
 */
export function useE2eApp(
  hooks: { before?: () => Promise<void>; after?: () => Promise<void> } = {},
): E2eContext {
  const context = {} as E2eContext
  beforeAll(async () => {
    await hooks.before?.()
    context.app = await startAppServer()
    context.browser = await launchBrowser()
  })
  afterAll(async () => {
    await context.browser?.close()
    await hooks.after?.()
    await context.app?.close()
  })
  return context
}

/**
 * A fresh tab that saves a picture as `test-results/e2e/<name>-failed.png` if the test fails.
 * @param name what the test is about, e.g. `floor-keyboard`
 */
export async function openPage(context: E2eContext, name: string): Promise<Page> {
  const page = await context.browser.newPage()
  screenshotOnFailure(page, name)
  return page
}

/** Saves named pictures of the page in `test-results/e2e/`, e.g. `picture('lot-grid')`. */
export function picturesOf(page: Page, isFullPage = false) {
  mkdirSync(E2E_RESULTS_DIR, { recursive: true })
  return (name: string, fullPage = isFullPage) =>
    page.screenshot({ path: join(E2E_RESULTS_DIR, `${name}.png`), fullPage })
}

/** Calls the API from inside the page, with the page's session cookie and a CSRF token. */
export async function callApi<T>(
  page: Page,
  path: string,
  method = 'GET',
  body?: unknown,
): Promise<T> {
  return page.evaluate(
    async ({ path, method, body }) => {
      const headers: Record<string, string> = { Accept: 'application/json' }
      if (method !== 'GET') {
        headers['Content-Type'] = 'application/json'
        headers['X-CSRF-Token'] = (await (await fetch('/api/auth/csrf')).json()).csrfToken
      }
      const response = await fetch(`/api${path}`, {
        method,
        headers,
        body: body === undefined ? undefined : JSON.stringify(body),
      })
      if (!response.ok)
        throw new Error(`${method} ${path}: ${response.status} ${await response.text()}`)
      return response.status === 204 ? null : response.json()
    },
    { path, method, body },
  ) as Promise<T>
}

/**
 * Signs in through the API, quicker than the form when the form is not what a test is about.
 * @param page a tab already on one of the app's pages, so the cookie lands on its origin
 */
export async function signInByApi(page: Page, role: DemoRole): Promise<void> {
  await callApi(page, '/auth/login', 'POST', { email: demoEmail(role), password: DEMO_PASSWORD })
}

/**
 * A fresh tab (as openPage) on the sign-in page, signed in as `role` through the API: for a test
 * that sets its data up through the API before it looks at a screen.
 */
export async function openPageSignedIn(
  context: E2eContext,
  name: string,
  role: DemoRole,
): Promise<Page> {
  const page = await openPage(context, name)
  await page.goto(`${context.app.baseUrl}/signin`)
  await signInByApi(page, role)
  return page
}

/**
 * Signs in through the form of the sign-in page the tab shows, as a person does, and waits
 * until the app has left that page.
 */
export async function signInHere(page: Page, role: DemoRole): Promise<void> {
  await signInThroughForm(page, demoEmail(role), DEMO_PASSWORD)
  await page.waitForURL((url) => url.pathname !== '/signin')
}

/**
 * Opens the sign-in page, on its way to `next` when given, and signs in through the form.
 * @param next where the app goes after signing in, e.g. `/yield`
 */
export async function signInAs(
  context: E2eContext,
  page: Page,
  role: DemoRole,
  next?: string,
): Promise<void> {
  const query = next ? `?next=${encodeURIComponent(next)}` : ''
  await page.goto(`${context.app.baseUrl}/signin${query}`)
  await signInHere(page, role)
}
