// The one time setting of the e2e suite. Every wait on a condition (playwright's locators and
// waits, vitest's expect.poll) is bounded by E2E_WAIT_MS; a test or a set-up hook, which waits
// many times, by E2E_TEST_MS. vitest.config.ts reads both for the e2e project, so a slow machine
// needs only `WAYMARK_E2E_WAIT_MS=60000` and nothing in a test file names a time of its own.

const DEFAULT_WAIT_MS = 30_000

function waitFromEnv(): number {
  const raw = process.env.WAYMARK_E2E_WAIT_MS
  if (raw === undefined || raw === '') return DEFAULT_WAIT_MS
  const ms = Number(raw)
  if (!Number.isInteger(ms) || ms < 1000)
    throw new Error(`WAYMARK_E2E_WAIT_MS: a whole number of milliseconds ≥ 1000, not "${raw}"`)
  return ms
}

/** How long one wait on a condition may take before the test fails (ms). */
export const E2E_WAIT_MS = waitFromEnv()

/** How long one test or set-up hook may take: room for a dozen slow waits (ms). */
export const E2E_TEST_MS = E2E_WAIT_MS * 12
