import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import type { UnitState } from '../../shared/lots'
import { wilsonInterval } from '../../shared/quality/proportion'
import { lotYield } from '../../shared/quality/yieldStats'
import type { StepRun } from '../../shared/quality/yieldStats'
import type { LotYieldDto, YieldSummaryDto } from '../../shared/schemas/yield'
import { db } from '../../server/models'
import { LOT_ROLES, signedInRoles } from './support/client'
import { releasedTestLot, runMixedLot } from './support/floor'
import type { TestLot } from './support/floor'

const day = (offset: number) =>
  new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10)

describe('yield figures', () => {
  const { engineer, lead, stores, operator } = signedInRoles(...LOT_ROLES)
  let t: TestLot

  beforeAll(async () => {
    // Units 1 and 2 pass both steps at the first attempt; unit 3 is reworked and passes both at
    // attempt 2; unit 4 is scrapped at winding; unit 5 waits at the load test (runMixedLot).
    const mixed = await runMixedLot({ engineer, lead, stores, operator })
    t = mixed.t
    expect(mixed.reworkedRetest.body).toMatchObject({
      stepRun: { attempt: 2 },
      unit: { state: 'passed' },
    })
  })

  it('gives a lot its step FPYs, RTY, lot FPY, final yield, DPU and WIP', async () => {
    const y = (await lead.get(`/api/yield/lots/${t.lot.id}`).expect(200)).body as LotYieldDto
    expect(y.lotId).toBe(t.lot.id)
    expect(y.steps.map((s) => [s.name, s.position])).toEqual([
      ['Winding', 1],
      ['Load test', 2],
    ])
    const [winding, load] = y.steps as [LotYieldDto['steps'][0], LotYieldDto['steps'][0]]

    // Step FPY = first-attempt passes / first attempts (common practice, no source).
    // Winding attempt-1 rows: units 1, 2, 3, 4, 5 = 5; passes: 1, 2, 3, 5 = 4 (unit 4 failed);
    // unit 3's rewind is attempt 2 and is not counted. FPY = 4/5 = 0.8.
    expect(winding).toMatchObject({ stepId: t.rev.steps[0]!.id, firstAttempts: 5, passedFirst: 4 })
    expect(winding.fpy).toBeCloseTo(0.8, 12)
    // Load test attempt-1 rows: units 1, 2, 3 = 3 (4 was scrapped before it, 5 has not reached
    // it); passes: 1, 2 = 2 (unit 3 read 340 V). FPY = 2/3 (common practice, no source).
    expect(load).toMatchObject({ firstAttempts: 3, passedFirst: 2 })
    expect(load.fpy).toBeCloseTo(2 / 3, 12)
    // 95 % intervals: Wilson (1927); see tests/unit/shared/quality.
    expect(winding.interval).toEqual(wilsonInterval(4, 5))
    expect(load.interval).toEqual(wilsonInterval(2, 3))

    // RTY = product of the step FPYs = 0.8 × 2/3 = 0.5333… (common practice, no source).
    expect(y.rty).toBeCloseTo(0.8 * (2 / 3), 12)

    // Units: 1, 2, 3 passed; 4 scrapped; 5 in progress. Started (≥ 1 run) = 5; finished
    // (passed, shipped, returned, scrapped) = 4 (common practice, no source).
    expect(y).toMatchObject({ started: 5, finished: 4, passed: 3, scrapped: 1 })
    // Lot FPY = units that passed every step at the first attempt / finished = units 1, 2 out
    // of 4 = 0.5; unit 3 passed only after rework (common practice, no source).
    expect(y.lotFpy.value).toBeCloseTo(0.5, 12)
    // Final yield = passed / finished = 3/4 = 0.75 (common practice, no source).
    expect(y.finalYield.value).toBeCloseTo(0.75, 12)
    // Wilson (1927); see tests/unit/shared/quality.
    expect(y.lotFpy.interval).toEqual(wilsonInterval(2, 4))
    expect(y.finalYield.interval).toEqual(wilsonInterval(3, 4))
    // DPU = failed step runs / units started = 2 (unit 3's load test, unit 4's winding) / 5 = 0.4
    // (common practice, no source).
    expect(y.dpu).toBeCloseTo(0.4, 12)

    // WIP: only unit 5 is still on the route, waiting at the load test.
    expect(y.wip).toEqual([
      { stepName: 'Winding', stationKind: 'winding', units: 0 },
      { stepName: 'Load test', stationKind: 'load_test', units: 1 },
    ])
  })

  it('agrees with the shared lotYield computed from every row of the lot', async () => {
    // Test only: load the rows the SQL aggregates, to hold it to the shared definition.
    const rows = (sql: string) =>
      db().query(sql, { replacements: { lotId: t.lot.id }, type: QueryTypes.SELECT })
    const runs = (await rows(
      `SELECT sr.unit_id AS "unitId", sr.step_id AS "stepId", sr.attempt, sr.result
         FROM step_runs sr JOIN units u ON u.id = sr.unit_id WHERE u.lot_id = :lotId`,
    )) as StepRun[]
    const units = (await rows('SELECT id AS "unitId", state FROM units WHERE lot_id = :lotId')) as {
      unitId: string
      state: UnitState
    }[]
    const want = lotYield({ runs, units, stepIds: t.rev.steps.map((s) => s.id) })
    const got = (await lead.get(`/api/yield/lots/${t.lot.id}`).expect(200)).body as LotYieldDto
    expect(got).toMatchObject({
      rty: want.rty,
      dpu: want.dpu,
      started: want.started,
      finished: want.finished,
      lotFpy: { value: want.lotFpy },
      finalYield: { value: want.finalYield },
    })
    for (const step of got.steps) {
      const { passedFirst, firstAttempts, fpy, interval } = want.stepFpy[step.stepId]!
      expect(step).toMatchObject({ passedFirst, firstAttempts, fpy, interval })
    }
  })

  it('gives nulls, not NaN, for a lot nothing has been run on, and 404 for an unknown lot', async () => {
    const empty = await releasedTestLot({ engineer, lead, stores }, 2)
    const res = await engineer.get(`/api/yield/lots/${empty.lot.id}`).expect(200)
    const y = res.body as LotYieldDto
    expect(y.steps.map((s) => [s.firstAttempts, s.passedFirst, s.fpy])).toEqual([
      [0, 0, null],
      [0, 0, null],
    ])
    expect(y).toMatchObject({ rty: null, dpu: null, started: 0, finished: 0 })
    expect(y.lotFpy).toEqual({ value: null, interval: wilsonInterval(0, 0) })
    expect(y.finalYield.value).toBeNull()
    expect(y.wip.map((w) => w.units)).toEqual([2, 0])
    expect(res.text).not.toMatch(/NaN/)
    await lead.get(`/api/yield/lots/${randomUUID()}`).expect(404)
    await lead.get('/api/yield/lots/not-an-id').expect(400)
  })

  it('lists the lots run in a period with their figures and the period KPIs', async () => {
    const query = `from=${day(-1)}&to=${day(1)}&productId=&revisionId=${t.rev.id}`
    const s = (await engineer.get(`/api/yield/summary?${query}`).expect(200))
      .body as YieldSummaryDto
    expect(s.lots).toHaveLength(1)
    const [row] = s.lots
    expect(row).toMatchObject({
      lotId: t.lot.id,
      number: t.lot.number,
      productCode: t.lot.productCode,
      revisionLetter: t.rev.letter,
      started: 5,
      finished: 4,
      wip: 1,
    })
    // The same figures as the lot's own, worked out above (common practice, no source).
    expect(row!.lotFpy).toBeCloseTo(2 / 4, 12)
    expect(row!.finalYield).toBeCloseTo(3 / 4, 12)
    expect(row!.rty).toBeCloseTo(0.8 * (2 / 3), 12)

    // One lot of one revision, so the KPIs are that lot's: FPY 2/4, final yield 3/4,
    // RTY 0.8 × 2/3, DPU 2/5 (common practice, no source).
    expect(s.kpis).toMatchObject({ started: 5, finished: 4 })
    expect(s.kpis.fpy.value).toBeCloseTo(0.5, 12)
    expect(s.kpis.finalYield.value).toBeCloseTo(0.75, 12)
    expect(s.kpis.rty).toBeCloseTo(0.8 * (2 / 3), 12)
    expect(s.kpis.dpu).toBeCloseTo(0.4, 12)
    // Wilson (1927); see tests/unit/shared/quality.
    expect(s.kpis.fpy.interval).toEqual(wilsonInterval(2, 4))
    expect(s.kpis.finalYield.interval).toEqual(wilsonInterval(3, 4))

    const byProduct = await lead.get(
      `/api/yield/summary?from=${day(-1)}&to=${day(1)}&productId=${t.rev.productId}`,
    )
    expect(byProduct.body.lots.map((l: { lotId: string }) => l.lotId)).toEqual([t.lot.id])
  })

  it('returns an empty table and null KPIs for a period without runs, and refuses bad periods', async () => {
    const none = await lead.get('/api/yield/summary?from=2000-01-01&to=2000-01-31').expect(200)
    expect(none.body).toEqual({
      from: '2000-01-01',
      to: '2000-01-31',
      lots: [],
      kpis: {
        started: 0,
        finished: 0,
        fpy: { value: null, interval: { low: 0, high: 1 } },
        finalYield: { value: null, interval: { low: 0, high: 1 } },
        rty: null,
        dpu: null,
      },
    })
    const backwards = await lead.get('/api/yield/summary?from=2026-12-02&to=2026-12-01')
    expect(backwards.status).toBe(400)
    expect(backwards.body.fields).toEqual({ to: 'the period ends before it starts' })
    const noDates = await lead.get('/api/yield/summary')
    expect(noDates.status).toBe(400)
    expect(noDates.body.fields).toHaveProperty('from')
  })
})
