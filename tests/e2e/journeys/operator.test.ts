import { describe, expect, it } from 'vitest'
import type { UnitTraceDto } from '../../../shared/schemas/trace'
import type { StationKind } from '../../../shared/stations'
import {
  DEMO_ROUTE,
  revisionsWithRoute,
  stationOf,
  stepOf,
  unitWaitingAtStart,
  usableLotCodes,
} from '../support/demo'
import {
  recordPass,
  scanMaterials,
  scanTraveler,
  typePassingReadings,
} from '../support/floorDriver'
import { callApi, openPageSignedIn, signInByApi, signInHere, useE2eApp } from '../support/setup'

const ROUTE = DEMO_ROUTE

describe('Operator journey', () => {
  const e2e = useE2eApp()

  it('takes a unit through winding, soldering, hipot with a second signature, and load test', async () => {
    // The lead's side, through the API: a demo product whose route has the four steps with lots
    // to fit at winding, a hipot that needs a second person, and a unit waiting at its start.
    const page = await openPageSignedIn(e2e, 'journey-operator', 'lead')
    const revision = (await revisionsWithRoute(page, ROUTE)).find(
      (r) =>
        r.bom.some((b) => b.fittedAtStepId === stepOf(r, 'winding').id) &&
        stepOf(r, 'hipot').requiresSignoff,
    )
    expect(revision, 'a released demo revision with the four steps').toBeTruthy()
    const rev = revision!
    const { serial } = await unitWaitingAtStart(page, rev, 'Journey: operator')
    const codes = await usableLotCodes(page, rev.bom)
    const stations = new Map<StationKind, string>()
    for (const kind of ROUTE) stations.set(kind, await stationOf(page, kind))
    await callApi(page, '/auth/logout', 'POST')

    // The operator signs in at the winding bench and works the unit along its route.
    await page.goto(`${e2e.app.baseUrl}/floor/${stations.get('winding')}`)
    await page.waitForURL(/\/signin\?next=/)
    await signInHere(page, 'operator')
    for (const kind of ROUTE) {
      const step = stepOf(rev, kind)
      if (kind !== 'winding') await page.goto(`${e2e.app.baseUrl}/floor/${stations.get(kind)}`)
      await scanTraveler(page, serial)
      await page.getByRole('region', { name: `Step ${step.position}: ${step.name}` }).waitFor()

      // High voltage at hipot and load test: the caution stands above the readings.
      const caution = page.locator('[data-test="hv-caution"]')
      if (kind === 'hipot' || kind === 'load_test') {
        await caution.waitFor()
        expect(await caution.textContent()).toContain('High voltage')
      } else expect(await caution.count()).toBe(0)

      await typePassingReadings(page, step)
      await scanMaterials(page, rev, step, codes)
      await recordPass(page, serial, step.requiresSignoff ? 'lead' : undefined)
      const next = rev.steps[rev.steps.indexOf(step) + 1]
      expect(await page.locator('[data-test="floor-notice"]').textContent()).toContain(
        next ? `Next: ${next.name}` : 'route is complete',
      )
    }

    // The unit's history names the second person who signed the hipot run.
    await callApi(page, '/auth/logout', 'POST')
    await signInByApi(page, 'lead')
    const trace = await callApi<UnitTraceDto>(page, `/trace/units/${serial}`)
    const { user } = await callApi<{ user: { name: string } }>(page, '/auth/me')
    // A unit picked from a demo lot may carry runs from before a rework: the last four are ours.
    const runs = trace.stepRuns.slice(-4).map((r) => [r.stationKind, r.result, r.countersignedBy])
    expect(runs).toEqual([
      ['winding', 'pass', null],
      ['soldering', 'pass', null],
      ['hipot', 'pass', user.name],
      ['load_test', 'pass', null],
    ])
    // The component-lot scans are on the unit's record, one per BOM line fitted so far.
    const ours = new Set(trace.stepRuns.slice(-4).map((r) => r.id))
    const fitted = trace.consumptions
      .filter((c) => ours.has(c.stepRunId))
      .map((c) => c.partNumber)
      .sort()
    const expected = rev.bom
      .filter((b) => ROUTE.some((k) => stepOf(rev, k).id === b.fittedAtStepId))
      .map((b) => b.partNumber)
      .sort()
    expect(fitted).toEqual(expected)
    await page.close()
  })
})
