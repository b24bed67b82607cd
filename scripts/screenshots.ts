// `npm run screenshots`: a PNG of every main screen of the demo shop, one role after another.
import { mkdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { ServiceError } from './lib/proc'
import { testRunEnv } from './lib/serviceConfig'
import { startServices } from './lib/services'
import { bin, prepareDatabase, runStep } from './lib/steps'

const HELP = `usage: npm run screenshots   (tsx scripts/screenshots.ts)

Starts the services, resets and seeds the test database (waymark_test, or the one of
WAYMARK_TEST_LANE, as \`npm test\` does: never the \`npm start\` database), builds the client,
then starts the app the way the e2e tests do and signs in as each demo role in Debian's
Chromium. Saves a 1440×900 PNG
of every main screen to docs/screenshots/ and prints each file's size.

environment: WAYMARK_CHROMIUM (/usr/bin/chromium), plus the service variables of
scripts/services.ts`

const OUT_DIR = 'docs/screenshots'
const VIEWPORT = { width: 1440, height: 900 }

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(HELP)
    return 0
  }
  const { config } = await startServices()
  const env = testRunEnv(config)
  // The server reads its settings from process.env when its modules load: set them first.
  Object.assign(process.env, env)
  const { emptyLaneQueues, startMailFake } = await import('./lib/screenshotSetup')
  // The lane's Redis outlives its database: empty it, so the Status page shows the demo's jobs.
  console.log(`==> emptied this lane's queues (${await emptyLaneQueues()} jobs of earlier runs)`)
  const prepared = await prepareDatabase(config, env, ['--reset'], [])
  if (prepared !== 0) return prepared
  const built = await runStep('build client', config, bin(config, 'vite'), ['build'], {
    ...env,
    NODE_ENV: 'production',
  })
  if (built !== 0) return built

  const { startAppServer } = await import('../tests/e2e/support/appServer')
  const { launchBrowser, waitForStillness } = await import('../tests/e2e/support/browser')
  const { SCREENS, findSubjects } = await import('./lib/screenshotScreens')

  console.log('\n==> screenshots')
  mkdirSync(OUT_DIR, { recursive: true })
  // A mail fake in this process, so the Status page shows a mail relay (no worker sends).
  const mail = await startMailFake()
  const app = await startAppServer()
  const browser = await launchBrowser()
  let failures = 0
  try {
    const page = await browser.newPage()
    await page.setViewportSize(VIEWPORT)
    const subjects = await findSubjects(page, app.baseUrl)
    for (const screen of SCREENS) {
      const file = join(OUT_DIR, `${screen.name}.png`)
      try {
        await screen.show(page, app.baseUrl, subjects)
        await page.mouse.move(0, 0)
        await waitForStillness(page)
        await page.screenshot({ path: file })
        console.log(`  ${file}  ${Math.round(statSync(file).size / 1024)} KB`)
      } catch (err) {
        failures++
        console.error(`  ${file}: not taken: ${err instanceof Error ? err.message : String(err)}`)
      }
    }
  } finally {
    await browser.close()
    await app.close()
    await mail.close()
  }
  return failures === 0 ? 0 : 1
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err instanceof ServiceError ? `screenshots: ${err.message}` : err)
    process.exit(1)
  },
)
