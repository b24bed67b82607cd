import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium } from 'playwright-core'
import type { BrowserContext, Page } from 'playwright-core'
import { onTestFailed } from 'vitest'
import { E2E_WAIT_MS } from './timeouts'

/** Where e2e pictures go; the folder is gitignored. */
export const E2E_RESULTS_DIR = 'test-results/e2e'

/** Debian's Chromium; playwright-core ships no browser of its own. */
export const CHROMIUM_PATH = process.env.WAYMARK_CHROMIUM ?? '/usr/bin/chromium'

// Flags seen working in containers (TOOLCHAIN.md): no sandbox as root, no GPU, and nothing
// that phones home, so a run is the same with or without a network.
const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
]

export interface TestBrowser {
  context: BrowserContext
  /** A fresh tab at 1280×800, the size screenshots are judged at. */
  newPage(): Promise<Page>
  close(): Promise<void>
}

/**
 * Launches headless Chromium with a throw-away profile. A persistent context is used because
 * Chromium refuses `--user-data-dir` passed as a plain argument through playwright.
 */
export async function launchBrowser(): Promise<TestBrowser> {
  const profileDir = mkdtempSync(join(tmpdir(), 'waymark-e2e-'))
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: { width: 1280, height: 800 },
  })
  context.setDefaultTimeout(E2E_WAIT_MS)
  context.setDefaultNavigationTimeout(E2E_WAIT_MS)
  return {
    context,
    newPage: () => context.newPage(),
    async close() {
      await context.close()
      rmSync(profileDir, { recursive: true, force: true })
    },
  }
}

/**
 * Signs in through the sign-in page, the way a person does, and waits until the app has left it.
 * @param page a tab already on the sign-in page (or on a page that redirects there)
 */
export async function signInThroughForm(
  page: Page,
  email: string,
  password: string,
): Promise<void> {
  await page.locator('input[name="email"]').fill(email)
  await page.locator('input[name="password"]').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/**
 * Saves what the page showed when the current test failed, as
 * `test-results/e2e/<name>-failed.png`; call it at the start of a test.
 */
export function screenshotOnFailure(page: Page, name: string): void {
  onTestFailed(async () => {
    mkdirSync(E2E_RESULTS_DIR, { recursive: true })
    await page.screenshot({ path: join(E2E_RESULTS_DIR, `${name}-failed.png`) }).catch(() => {})
  })
}

/**
 * Waits until the page has no running animation or transition (a dialog's fade, a message
 * sliding in), so a picture shows the screen at rest. A condition, not a pause: it returns as
 * soon as everything has finished, and fails after the suite's wait bound.
 */
export async function waitForStillness(page: Page): Promise<void> {
  await page.waitForFunction(() =>
    document.getAnimations().every((a) => a.playState !== 'running' && !a.pending),
  )
}
