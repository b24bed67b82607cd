// The screens `npm run screenshots` takes, and the demo entities they show, found through the
// API by what they are (the demo scenario may change; these behaviours do not).
import type { Page } from 'playwright-core'
import type { LotDto } from '../../shared/schemas/lots'
import type { StatisticsDto } from '../../shared/schemas/statistics'
import type { LotTurnDeviationDto } from '../../shared/schemas/yield'
import type { RevisionDto, StepDto } from '../../shared/schemas/recipes'
import {
  DEMO_ROUTE,
  passingEntry,
  revisionsWithRoute,
  stationOf,
  unitWaitingAtStart,
} from '../../tests/e2e/support/demo'
import { callApi, signInByApi, signInHere } from '../../tests/e2e/support/setup'
import type { DemoRole } from '../../tests/e2e/support/setup'

/** What the pictures show, looked up once as the lead before the first one. */
export interface Subjects {
  revision: RevisionDto
  windingStation: string
  /** A unit waiting at winding, for the Floor with a failing reading. */
  waitingSerial: string
  /** The lot in progress with the most units. */
  lotId: string
  /** The lot whose secondary turns look most suspect, and the first day of its runs. */
  turnsLot: { number: string; from: string }
  /** A lot with enough readings of one load-test check to chart, and that check's label. */
  statsLot: { id: string; label: string }
  /** The unit with the richest history, and a component lot it holds. */
  traceSerial: string
  componentLotCode: string
}

export interface Screen {
  name: string
  show(page: Page, base: string, subjects: Subjects): Promise<void>
}

/** Signs out whoever is signed in and signs in as `role` through the form; lands on the home. */
async function signIn(page: Page, base: string, role: DemoRole): Promise<void> {
  await page.goto(`${base}/signin`)
  await callApi(page, '/auth/logout', 'POST')
  await page.goto(`${base}/signin`)
  await signInHere(page, role)
  await page.waitForLoadState('networkidle')
}

/**
 * Opens a screen and waits until `ready` shows and the network is quiet. The focused field is
 * left, so a scan box does not show its text selected.
 */
async function open(page: Page, url: string, ready: string): Promise<void> {
  await page.goto(url)
  await page.locator(ready).first().waitFor()
  await page.waitForLoadState('networkidle')
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur())
}

const home = (role: DemoRole): Screen => ({
  name: `home-${role}`,
  show: (page, base) => signIn(page, base, role),
})

/** Types every reading of the step at its passing value except one, far over its limit. */
async function typeWithOneFailing(page: Page, step: StepDto): Promise<void> {
  // A measured value (not a count), as a slipped probe or a wrong core would give.
  const failing = step.checks.find(
    (c) =>
      c.kind === 'numeric' &&
      !c.derived &&
      c.lower !== null &&
      c.upper !== null &&
      c.lower < c.upper,
  )
  for (const check of step.checks) {
    const entry = passingEntry(check)
    if (entry === null) continue
    const field = page.locator(`[data-field="check:${check.key}"]`)
    if (check === failing) await field.fill((check.upper! * 1.4).toFixed(check.decimals))
    else if (check.kind === 'numeric' || check.kind === 'text') await field.fill(entry)
    else
      await field
        .getByRole('radio')
        .nth(check.kind === 'boolean' ? 0 : Number(entry) - 1)
        .click()
  }
  await page.locator('[data-test="verdict"][data-verdict="fail"]').waitFor()
  if (failing) await page.locator(`[data-field="check:${failing.key}"]`).focus()
}

export const SCREENS: readonly Screen[] = [
  home('operator'),
  {
    name: 'floor-waiting-for-scan',
    show: (page, base, s) => open(page, `${base}/floor/${s.windingStation}`, '.recent__item'),
  },
  {
    name: 'floor-failing-reading',
    async show(page, base, s) {
      await open(page, `${base}/floor/${s.windingStation}`, '[data-field="scan"]')
      await page.locator('[data-field="scan"]').focus()
      await page.keyboard.type(s.waitingSerial)
      await page.keyboard.press('Enter')
      await page.locator('[data-test="unit-serial"]').waitFor()
      await typeWithOneFailing(page, s.revision.steps[0]!)
    },
  },
  home('lead'),
  { name: 'lot', show: (page, base, s) => open(page, `${base}/lots/${s.lotId}`, '.grid-cell') },
  {
    name: 'lot-statistics',
    async show(page, base, s) {
      await open(page, `${base}/lots/${s.statsLot.id}`, '[data-test="lot-statistics"]')
      const panel = page.locator('[data-test="lot-statistics"]')
      await panel.locator('[data-test="check-picker"]').click()
      await page
        .locator('.el-select-dropdown__item:visible', { hasText: s.statsLot.label })
        .first()
        .click()
      await panel.locator('[data-test="mr-chart"] svg').waitFor()
      await panel.evaluate((p) => p.scrollIntoView({ block: 'start' }))
    },
  },
  {
    name: 'yield-turn-panel',
    async show(page, base, s) {
      await open(page, `${base}/yield`, '.el-table__row')
      const from = page.getByLabel('Period from')
      await from.fill(s.turnsLot.from)
      await from.press('Enter')
      await page.locator('.el-table__row', { hasText: s.turnsLot.number }).click()
      await page.locator('article[data-verdict]').waitFor()
      await page.waitForLoadState('networkidle')
      await page
        .getByRole('heading', { name: 'Turn-count deviation' })
        .evaluate((h) => h.scrollIntoView({ block: 'start' }))
    },
  },
  home('engineer'),
  {
    name: 'recipes-revision',
    show: (page, base, s) =>
      open(page, `${base}/recipes/revisions/${s.revision.id}`, 'article[aria-label^="Step 1"]'),
  },
  home('stores'),
  { name: 'receiving', show: (page, base) => open(page, `${base}/receiving`, '.el-table__row') },
  home('service'),
  {
    name: 'trace-unit',
    show: (page, base, s) =>
      open(page, `${base}/trace?serial=${s.traceSerial}`, '[data-test="trace-serial"]'),
  },
  {
    name: 'trace-recall-scope',
    show: (page, base, s) =>
      open(page, `${base}/trace?lot=${s.componentLotCode}`, '[data-test="recall-code"]'),
  },
  {
    name: 'shipping',
    show: (page, base) => open(page, `${base}/shipping`, '[data-test="ship-scan"]'),
  },
  { name: 'service', show: (page, base) => open(page, `${base}/service`, '.el-table__row') },
  home('admin'),
  { name: 'outbox', show: (page, base) => open(page, `${base}/outbox`, '.el-table__row') },
  {
    // The shop's own changes to lots: this script's sign-ins would otherwise fill the page.
    name: 'audit',
    async show(page, base) {
      await open(page, `${base}/admin/audit`, '.el-table__row')
      // Lot numbers read L-0001…: the record filter finds the lots' own rows.
      await page.getByPlaceholder('Serial, lot, code or name').fill('L-00')
      await page.getByRole('button', { name: 'Search', exact: true }).click()
      await page.locator('.el-table__row', { hasText: 'lot L-00' }).first().waitFor()
      await page.waitForLoadState('networkidle')
    },
  },
]

/** Looks up, as the lead, everything the pictures show. */
export async function findSubjects(page: Page, base: string): Promise<Subjects> {
  await page.goto(`${base}/signin`)
  await signInByApi(page, 'lead')
  // The revision with the most checks: the richest recipe page and Floor form.
  const checks = (r: RevisionDto) => r.steps.reduce((n, step) => n + step.checks.length, 0)
  const [revision] = (await revisionsWithRoute(page, DEMO_ROUTE)).sort(
    (a, b) => checks(b) - checks(a),
  )
  if (!revision) throw new Error('the demo has no product with the full route')
  const { serial } = await unitWaitingAtStart(page, revision, 'Screenshots')
  const lots = await callApi<LotDto[]>(page, '/lots')
  const inProgress = lots
    .filter((l) => l.status === 'in_progress')
    .sort((a, b) => (b.counts.in_progress ?? 0) - (a.counts.in_progress ?? 0))
  let turnsLot = { number: '', from: '', suspects: -1 }
  for (const lot of lots.filter((l) => l.status !== 'planned')) {
    const turns = await callApi<LotTurnDeviationDto>(page, `/yield/lots/${lot.id}/turns`)
    for (const winding of turns.windings) {
      const suspects = winding.suspects
      const first = winding.runs[0]?.finishedAt
      if (first && suspects > turnsLot.suspects)
        turnsLot = { number: lot.number, from: first.slice(0, 10), suspects }
    }
  }
  let statsLot = { id: '', label: '' }
  for (const lot of lots.filter((l) => l.status !== 'planned')) {
    const stats = await callApi<StatisticsDto>(page, `/yield/lots/${lot.id}/statistics`)
    const eff = stats.checks.find((c) => c.key === 'efficiency_pct' && c.readings >= 8)
    if (eff) {
      statsLot = { id: lot.id, label: eff.label }
      break
    }
  }
  if (!statsLot.id) throw new Error('the demo has no lot with eight efficiency readings')
  const trace = await busiestUnit(page, lots)
  const windingStation = await stationOf(page, 'winding')
  await callApi(page, '/auth/logout', 'POST')
  return {
    revision,
    windingStation,
    waitingSerial: serial,
    lotId: (inProgress[0] ?? lots[0]!).id,
    turnsLot,
    statsLot,
    ...trace,
  }
}

/** The unit with the most step runs in the lot with the most runs closed, and a lot it holds. */
async function busiestUnit(
  page: Page,
  lots: LotDto[],
): Promise<{ traceSerial: string; componentLotCode: string }> {
  const done = lots.filter((l) => (l.counts.shipped ?? 0) + (l.counts.passed ?? 0) > 0)
  let best = { traceSerial: '', componentLotCode: '', runs: -1 }
  for (const lot of done.slice(0, 3)) {
    const grid = await callApi<{ units: { serial: string; cells: unknown[] }[] }>(
      page,
      `/lots/${lot.id}/grid`,
    )
    for (const unit of grid.units.slice(0, 5)) {
      const trace = await callApi<{
        stepRuns: unknown[]
        nonconformances: unknown[]
        consumptions: { internalCode: string }[]
      }>(page, `/trace/units/${unit.serial}`)
      const score = trace.stepRuns.length + 10 * trace.nonconformances.length
      if (score > best.runs && trace.consumptions[0])
        best = {
          traceSerial: unit.serial,
          componentLotCode: trace.consumptions[0].internalCode,
          runs: score,
        }
    }
  }
  if (!best.traceSerial) throw new Error('the demo has no finished unit to trace')
  return best
}
