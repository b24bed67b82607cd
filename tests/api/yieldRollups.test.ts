import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import { OPEN_UNIT_STATES } from '../../shared/lots'
import type { LotYieldDto } from '../../shared/schemas/yield'
import { db } from '../../server/models'
import { signedInRoles } from './support/client'

// A lot with no unit in work keeps its step figures in lot_step_yields (yieldQueries.ts), and
// they are used only while the lot has the step-run count they were computed from.

const OPEN = [...OPEN_UNIT_STATES, 'on_hold']

async function settledLotId(): Promise<string> {
  const [row] = await db().query<{ id: string }>(
    `SELECT l.id FROM lots l
      WHERE EXISTS (SELECT 1 FROM units u WHERE u.lot_id = l.id AND u.run_count > 0)
        AND NOT EXISTS (SELECT 1 FROM units u WHERE u.lot_id = l.id AND u.state IN (:open))
      ORDER BY l.number LIMIT 1`,
    { replacements: { open: OPEN }, type: QueryTypes.SELECT },
  )
  if (!row) throw new Error('the demo has no lot without units in work')
  return row.id
}

const kept = (lotId: string) =>
  db().query<{ step_id: string; first_attempts: number; runs: number }>(
    'SELECT step_id, first_attempts, runs FROM lot_step_yields WHERE lot_id = :lotId',
    { replacements: { lotId }, type: QueryTypes.SELECT },
  )

const lotRuns = async (lotId: string) =>
  Number(
    (
      await db().query<{ n: string }>(
        'SELECT count(*) AS n FROM step_runs sr JOIN units u ON u.id = sr.unit_id WHERE u.lot_id = :lotId',
        { replacements: { lotId }, type: QueryTypes.SELECT },
      )
    )[0]!.n,
  )

describe('kept step figures of settled lots', () => {
  const { lead } = signedInRoles('lead')
  let lotId: string
  let first: LotYieldDto

  beforeAll(async () => {
    lotId = await settledLotId()
    await db().query('DELETE FROM lot_step_yields WHERE lot_id = :lotId', {
      replacements: { lotId },
    })
    first = (await lead.get(`/api/yield/lots/${lotId}`).expect(200)).body as LotYieldDto
  })

  it('keeps one row per route step, computed from all of the lot’s step runs', async () => {
    const rows = await kept(lotId)
    expect(rows.map((r) => r.step_id).sort()).toEqual(first.steps.map((s) => s.stepId).sort())
    const runs = await lotRuns(lotId)
    expect(rows.every((r) => r.runs === runs)).toBe(true)
  })

  it('answers from the kept rows while the run count matches', async () => {
    const step = first.steps[0]!
    await db().query(
      'UPDATE lot_step_yields SET first_attempts = first_attempts + 1000 WHERE lot_id = :lotId AND step_id = :stepId',
      { replacements: { lotId, stepId: step.stepId } },
    )
    const again = (await lead.get(`/api/yield/lots/${lotId}`).expect(200)).body as LotYieldDto
    expect(again.steps[0]!.firstAttempts).toBe(step.firstAttempts + 1000)
  })

  it('counts again, and keeps the new figures, once the run count differs', async () => {
    await db().query('UPDATE lot_step_yields SET runs = runs - 1 WHERE lot_id = :lotId', {
      replacements: { lotId },
    })
    const recounted = (await lead.get(`/api/yield/lots/${lotId}`).expect(200)).body as LotYieldDto
    expect(recounted.steps).toEqual(first.steps)
    const runs = await lotRuns(lotId)
    expect((await kept(lotId)).every((r) => r.runs === runs)).toBe(true)
  })
})

// The scan statement keeps units' run counters and lot_run_days as it writes each step run; the
// demo's lots (with fails, reworks and scraps) and every test's scans must leave them agreeing
// with the step runs themselves.
describe('yield rollups', () => {
  it('match a recount of the step runs for every unit and lot day', async () => {
    const [units] = await db().query<{ off: string; runs: string }>(
      `SELECT count(*) FILTER (WHERE u.run_count <> coalesce(c.runs, 0)
                                 OR u.fail_count <> coalesce(c.fails, 0)
                                 OR u.first_attempt_count <> coalesce(c.firsts, 0)) AS off,
              coalesce(sum(c.runs), 0) AS runs
         FROM units u
         LEFT JOIN (SELECT unit_id, count(*) AS runs,
                           count(*) FILTER (WHERE result = 'fail') AS fails,
                           count(*) FILTER (WHERE attempt = 1) AS firsts
                      FROM step_runs GROUP BY unit_id) c ON c.unit_id = u.id`,
      { type: QueryTypes.SELECT },
    )
    expect(Number(units!.runs)).toBeGreaterThan(100)
    expect(Number(units!.off)).toBe(0)
    const [days] = await db().query<{ missing: string; extra: string }>(
      `WITH actual AS (
         SELECT DISTINCT u.lot_id, (r.finished_at AT TIME ZONE 'UTC')::date AS day
           FROM step_runs r JOIN units u ON u.id = r.unit_id
       )
       SELECT (SELECT count(*) FROM (SELECT * FROM actual EXCEPT
                                     SELECT lot_id, day FROM lot_run_days) m) AS missing,
              (SELECT count(*) FROM (SELECT lot_id, day FROM lot_run_days EXCEPT
                                     SELECT * FROM actual) e) AS extra`,
      { type: QueryTypes.SELECT },
    )
    expect(days).toEqual({ missing: '0', extra: '0' })
  })
})
