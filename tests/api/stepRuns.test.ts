import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import { formatSerial } from '../../shared/serials'
import { sqlPool } from '../../server/db/pool'
import { ComponentLot, db } from '../../server/models'
import { recordStepRun } from '../../server/services/floor/stepRuns'
import { READ_SCANS, WRITE_RUNS, writeRunsValues } from '../../server/services/floor/stepRunSql'
import { StepRunInput } from '../../shared/schemas/lots'
import { LOT_ROLES, signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'

interface PlanNode {
  'Node Type': string
  'Relation Name'?: string
  'Index Name'?: string
  Plans?: PlanNode[]
}

async function count(sql: string, replacements: Record<string, unknown>): Promise<number> {
  const [row] = await db().query<{ n: string }>(sql, { replacements, type: QueryTypes.SELECT })
  return Number(row!.n)
}

describe('step runs at the Floor', () => {
  const { engineer, lead, stores, operator } = signedInRoles(...LOT_ROLES)
  let defectId: string
  const lot = (quantity: number, stock?: number) =>
    releasedTestLot({ engineer, lead, stores }, quantity, stock)

  beforeAll(async () => {
    defectId = (await operator.get('/api/defect-codes')).body.find(
      (d: { code: string }) => d.code === 'W-TURNS',
    ).id
  })

  it('records a pass, moves the unit on and takes the part out of stock', async () => {
    const t = await lot(2, 10)
    const serial = t.units[0]!.serial
    const res = await operator.post('/api/step-runs', windingRun(t, serial))
    expect(res.status).toBe(201)
    expect(res.body.stepRun).toMatchObject({ result: 'pass', attempt: 1 })
    expect(res.body.unit).toMatchObject({
      serial,
      state: 'in_progress',
      currentStep: { name: 'Load test' },
    })
    const cl = (await stores.get(`/api/component-lots?q=${t.componentLotCode}`)).body.rows[0]
    expect(cl.quantityRemaining).toBe(9)
    const lotNow = (await lead.get(`/api/lots/${t.lot.id}`)).body
    expect(lotNow.status).toBe('in_progress')
    const done = await operator.post('/api/step-runs', loadTestRun(serial, 350))
    expect(done.body.unit).toMatchObject({ state: 'passed', currentStep: null })
  })

  it('recomputes verdicts and derived values on the server', async () => {
    const t = await lot(1)
    const res = await operator.post(
      '/api/step-runs',
      windingRun(t, t.units[0]!.serial, { values: { l_sec: 24.3 } }),
    )
    expect(res.status).toBe(201) // 24.3 mH is inside 19–32 mH, and 90 turns is inside ±12 of 92
    const rows = await db().query<{
      key: string
      value_number: number
      is_derived: boolean
      is_pass: boolean
    }>(
      `SELECT c.key, m.value_number, m.is_derived, m.is_pass FROM measurements m JOIN checks c ON c.id = m.check_id WHERE m.step_run_id = :id ORDER BY c.position`,
      { replacements: { id: res.body.stepRun.id }, type: QueryTypes.SELECT },
    )
    // L = AL·N² (common practice): 24.3 mH on AL 3000 nH/turn² is 90 turns, so −2 from 92.
    expect(rows[1]).toMatchObject({ key: 'sec_dev', is_derived: true, is_pass: true })
    expect(rows[1]!.value_number).toBeCloseTo(-2, 9)
  })

  it('refuses, with words for the operator, a unit due at another station', async () => {
    const t = await lot(1)
    const res = await operator.post('/api/step-runs', loadTestRun(t.units[0]!.serial, 350))
    expect(res.status).toBe(409)
    expect(res.body.message).toBe(
      `${t.units[0]!.serial} is waiting for Winding; this is Load-test rack 1`,
    )
  })

  it('refuses a lot on hold, a unit on hold, a scrapped unit and a finished unit', async () => {
    const t = await lot(3)
    const [a, b, c] = t.units.map((u) => u.serial)
    await lead.post(`/api/lots/${t.lot.id}/hold`, { reason: 'wire lot suspect' }).expect(200)
    const held = await operator.post('/api/step-runs', windingRun(t, a!))
    expect(held.body.message).toMatch(/lot L-\d+ is on hold \(wire lot suspect\)/)
    await lead.post(`/api/lots/${t.lot.id}/unhold`, { reason: 'cleared' }).expect(200)
    const failed = await operator.post(
      '/api/step-runs',
      windingRun(t, b!, { values: { l_sec: 40 }, defectCodeId: defectId }),
    )
    expect(failed.body.unit.state).toBe('on_hold')
    const onHold = await operator.post('/api/step-runs', windingRun(t, b!))
    expect(onHold.status).toBe(409)
    expect(onHold.body.message).toMatch(/is on hold: failed Winding \(l_sec, sec_dev\)/)
    const [opened] = (await lead.get(`/api/nonconformances?serial=${b}`).expect(200)).body
    // The lot page and the disposition dialog show the checks by label, in route order.
    expect(opened.failedCheckLabels).toEqual(['Inductance', 'Deviation'])
    await lead
      .post(`/api/nonconformances/${failed.body.nonconformanceId}/disposition`, {
        disposition: 'scrap',
      })
      .expect(200)
    expect((await operator.post('/api/step-runs', windingRun(t, b!))).body.message).toMatch(
      /was scrapped/,
    )
    await operator.post('/api/step-runs', windingRun(t, c!)).expect(201)
    await operator.post('/api/step-runs', loadTestRun(c!, 350)).expect(201)
    expect((await operator.post('/api/step-runs', loadTestRun(c!, 350))).body.message).toMatch(
      /has finished its route/,
    )
  })

  it('refuses a mistyped serial with 400 and an unknown one with 404', async () => {
    const t = await lot(1)
    const serial = t.units[0]!.serial
    const typo = serial.slice(0, -1) + (serial.endsWith('0') ? '1' : '0')
    const mistyped = await operator.post('/api/step-runs', windingRun(t, typo))
    expect(mistyped.status).toBe(400)
    expect(mistyped.body.error).toBe('mistyped_serial')
    // A well-formed serial with a right check character that no lot ever allocated.
    const stranger = formatSerial('ZZ99', '2649', 1)
    const unknown = await operator.post(
      '/api/step-runs',
      windingRun(t, `https://x.example/u/${stranger}`),
    )
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toBe(`no unit ${stranger}: check the traveler`)
  })

  it('names a missing value and a missing component scan, and records nothing', async () => {
    const t = await lot(1)
    const serial = t.units[0]!.serial
    const noValue = await operator.post('/api/step-runs', windingRun(t, serial, { values: {} }))
    expect(noValue.status).toBe(400)
    expect(noValue.body.fields).toEqual({ 'values.l_sec': 'enter Inductance' })
    const noScan = await operator.post(
      '/api/step-runs',
      windingRun(t, serial, { consumptions: [] }),
    )
    expect(noScan.status).toBe(400)
    expect(Object.values(noScan.body.fields)[0]).toMatch(/scan a lot of TP-/)
    const noDefect = await operator.post(
      '/api/step-runs',
      windingRun(t, serial, { values: { l_sec: 40 } }),
    )
    expect(noDefect.body.fields).toEqual({ defectCodeId: 'choose a defect code' })
    expect(
      await count(
        'SELECT count(*) AS n FROM step_runs sr JOIN units u ON u.id = sr.unit_id WHERE u.serial = :serial',
        { serial },
      ),
    ).toBe(0)
  })

  it('refuses component lots that are quarantined, used up, expired or of another part', async () => {
    const t = await lot(3, 1)
    const [a, b] = t.units.map((u) => u.serial)
    await operator.post('/api/step-runs', windingRun(t, a!)).expect(201)
    const usedUp = await operator.post('/api/step-runs', windingRun(t, b!))
    expect(usedUp.status).toBe(409)
    expect(usedUp.body.message).toBe(`${t.componentLotCode} is used up; take a new lot from stores`)
    const lots = (await stores.get('/api/component-lots?q=HM-26-0502')).body.rows
    const quarantined = await operator.post(
      '/api/step-runs',
      windingRun(t, b!, {
        consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: lots[0].internalCode }],
      }),
    )
    expect(quarantined.body.message).toMatch(/is FCS-3000U; this line needs TP-/)
    const partId = t.rev.bom[0]!.partId
    const fresh = await stores.post('/api/component-lots', {
      partId,
      supplierName: 'X',
      supplierLotCode: `Q-${uniqueSuffix()}`,
      quantityReceived: 5,
      receivedOn: '2026-11-01',
    })
    await stores
      .post(`/api/component-lots/${fresh.body.id}/status`, {
        status: 'quarantined',
        reason: 'waiting for report',
      })
      .expect(200)
    const q = await operator.post(
      '/api/step-runs',
      windingRun(t, b!, {
        consumptions: [
          { bomLineId: t.rev.bom[0]!.id, code: `http://x/c/${fresh.body.internalCode}` },
        ],
      }),
    )
    expect(q.body.message).toBe(
      `${fresh.body.internalCode} is quarantined; take a lot that is available`,
    )
    // Test set-up only: backdate a lot's expiry, which the API allows only for parts that expire.
    const old = await stores.post('/api/component-lots', {
      partId,
      supplierName: 'X',
      supplierLotCode: `E-${uniqueSuffix()}`,
      quantityReceived: 5,
      receivedOn: '2026-01-01',
    })
    await ComponentLot.update({ expiresOn: '2026-02-01' }, { where: { id: old.body.id } })
    const expired = await operator.post(
      '/api/step-runs',
      windingRun(t, b!, {
        consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: old.body.internalCode }],
      }),
    )
    expect(expired.body.message).toBe(
      `${old.body.internalCode} expired on 2026-02-01; return it to stores`,
    )
  })

  /**
   * Sends every body at once, alternating two operators' sessions: exactly one may record (201),
   * every repeat (200) must answer that run, and the rest are refused (409). Sending the winning
   * body again must answer its run too.
   */
  async function race(bodies: { clientEventId: string }[]): Promise<void> {
    const other = await signedInAs('operator')
    const results = await Promise.all(
      bodies.map((body, i) => (i % 2 ? operator : other).post('/api/step-runs', body)),
    )
    const statuses = results.map((r) => r.status)
    expect(statuses.filter((s) => s === 201)).toHaveLength(1)
    expect(statuses.every((s) => [200, 201, 409].includes(s))).toBe(true)
    const won = results.findIndex((r) => r.status === 201)
    const winner = results[won]!.body.stepRun.id
    for (const r of results.filter((r) => r.status === 200)) expect(r.body.stepRun.id).toBe(winner)
    const again = await operator.post('/api/step-runs', bodies[won]!)
    expect(again.status).toBe(200)
    expect(again.body.stepRun.id).toBe(winner)
  }
  const runsOf = `SELECT count(*) AS n FROM step_runs sr JOIN units u ON u.id = sr.unit_id
                   WHERE u.serial = :serial`

  it('records exactly once under 20 concurrent duplicate and conflicting submissions', async () => {
    // Winding consumes a component lot, so these take the locked path.
    const t = await lot(1)
    const serial = t.units[0]!.serial
    const same = windingRun(t, serial)
    await race(
      Array.from({ length: 20 }, (_, i) =>
        i < 10 ? same : { ...same, clientEventId: randomUUID() },
      ),
    )
    expect(await count(runsOf, { serial })).toBe(1)
    const consumed = `SELECT count(*) AS n FROM consumptions c JOIN units u ON u.id = c.unit_id
                       WHERE u.serial = :serial`
    expect(await count(consumed, { serial })).toBe(1)
  })

  it('records once when 20 submissions race at a step without components (the unlocked path)', async () => {
    // The load test consumes nothing, so these take the read-then-guarded-write path: every
    // write but one must find the unit changed, and the duplicates must answer the winner.
    const t = await lot(1)
    const serial = t.units[0]!.serial
    await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    const same = loadTestRun(serial, 350)
    await race(Array.from({ length: 20 }, (_, i) => (i % 3 ? same : loadTestRun(serial, 350))))
    expect(await count(runsOf, { serial })).toBe(2)
    const audits = `SELECT count(*) AS n FROM audit_events
                     WHERE action = 'step_run.record' AND after->>'serial' = :serial`
    expect(await count(audits, { serial })).toBe(2)
    const counters = `SELECT run_count AS n FROM units WHERE serial = :serial`
    expect(await count(counters, { serial })).toBe(2)
  })

  it('records scans of many units that share one read and one write, each on its own', async () => {
    // Called in one turn of the event loop, these eight load tests share the scan's read and its
    // write (server/db/coalesce.ts); one fails, and one reuses another unit's event id, which
    // fails the shared write so that each is run again alone.
    const t = await lot(8)
    const serials = t.units.map((u) => u.serial)
    for (const serial of serials)
      await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    const me = (await operator.get('/api/auth/me').expect(200)).body.user
    const actor = { id: me.id, email: me.email, ip: '127.0.0.1', requestId: 'batch-test' }
    const inputs = serials.map((serial, i) =>
      StepRunInput.parse(
        loadTestRun(serial, i === 1 ? 340 : 350, i === 1 ? { defectCodeId: defectId } : {}),
      ),
    )
    inputs[7]!.clientEventId = inputs[6]!.clientEventId
    const out = await Promise.allSettled(inputs.map((input) => recordStepRun(input, actor)))
    const done = out.map((o) => (o.status === 'fulfilled' ? o.value : null))
    for (const i of [0, 2, 3, 4, 5])
      expect(done[i]).toMatchObject({ isRepeat: false, body: { stepRun: { result: 'pass' } } })
    expect(done[1]).toMatchObject({ isRepeat: false, body: { stepRun: { result: 'fail' } } })
    expect(done[1]!.body.nonconformanceId).toEqual(expect.any(String))
    // Of the two units sharing an event id, one is recorded and the other told to submit again.
    const pair = out.slice(6)
    expect(pair.filter((o) => o.status === 'fulfilled')).toHaveLength(1)
    const refused = pair.find((o) => o.status === 'rejected') as PromiseRejectedResult
    expect(refused.reason).toMatchObject({ status: 409, code: 'event_reused' })
    const recorded = serials.filter((_, i) => out[i]!.status === 'fulfilled')
    const rows = await db().query<{ serial: string; runs: number; checks: number; audits: number }>(
      `SELECT u.serial, u.run_count AS runs,
              (SELECT count(*)::int FROM measurements m JOIN step_runs r ON r.id = m.step_run_id
                WHERE r.unit_id = u.id) AS checks,
              (SELECT count(*)::int FROM audit_events a WHERE a.action = 'step_run.record'
                  AND a.entity_id = u.id::text) AS audits
         FROM units u WHERE u.serial IN (:serials) ORDER BY u.serial`,
      { replacements: { serials }, type: QueryTypes.SELECT },
    )
    for (const row of rows) {
      const runs = recorded.includes(row.serial) ? 2 : 1
      expect(row).toMatchObject({ runs, audits: runs })
      // The small recipe measures two values at winding (one derived) and one at load test.
      expect(row.checks).toBe(runs === 2 ? 3 : 2)
    }
    const held = `SELECT count(*) AS n FROM nonconformances n JOIN units u ON u.id = n.unit_id
                   WHERE u.serial = :serial AND u.state = 'on_hold'`
    expect(await count(held, { serial: serials[1] })).toBe(1)
  })

  it('moves the unit through its primary key, not by walking the units queued at its step', async () => {
    // With '=' guards on state and step, a plan over units_step_state_idx read every unit of a
    // just-released lot on each scan (2000 of them in scripts/bench/scan.ts).
    const t = await lot(120)
    const [unit] = await db().query<{ id: string; current_step_id: string; lot_id: string }>(
      'SELECT id, current_step_id, lot_id FROM units WHERE serial = :serial',
      { replacements: { serial: t.units[0]!.serial }, type: QueryTypes.SELECT },
    )
    const at = new Date()
    const values = writeRunsValues([
      {
        runId: randomUUID(),
        unitId: unit!.id,
        stepId: unit!.current_step_id,
        stationId: randomUUID(),
        operatorId: null,
        countersignedBy: null,
        attempt: 1,
        isRework: false,
        result: 'pass',
        note: '',
        clientEventId: randomUUID(),
        at,
        measurements: [],
        move: {
          state: 'in_progress',
          currentStepId: unit!.current_step_id,
          reworkUntilPosition: null,
          finishedAt: null,
          holdKind: null,
          heldFromState: null,
          holdReason: '',
        },
        lotId: unit!.lot_id,
        actorEmail: null,
        audit: '{}',
        ip: null,
        requestId: null,
        read: { runCount: 0, state: 'queued', reworkCount: 0 },
        nonconformance: null,
      },
    ])
    // A freshly seeded table looks tiny to the planner, which would then scan it whole; with
    // sequential scans off it must pick an index, and only the primary key may serve.
    const client = await sqlPool().connect()
    const rows = await (async () => {
      try {
        await client.query('BEGIN')
        await client.query('SET LOCAL enable_seqscan = off')
        const plan = await client.query<{ 'QUERY PLAN': unknown }>({
          text: `EXPLAIN (FORMAT JSON) ${WRITE_RUNS.text}`,
          values,
        })
        return plan.rows
      } finally {
        await client.query('ROLLBACK')
        client.release()
      }
    })()
    const scans: { 'Relation Name'?: string; 'Index Name'?: string; 'Node Type': string }[] = []
    const walk = (node: Record<string, unknown>) => {
      if (node['Relation Name'] === 'units' && node['Node Type'] !== 'ModifyTable')
        scans.push(node as (typeof scans)[number])
      for (const child of (node.Plans as Record<string, unknown>[] | undefined) ?? []) walk(child)
    }
    walk((rows[0]!['QUERY PLAN'] as { Plan: Record<string, unknown> }[])[0]!.Plan)
    expect(scans).toEqual([expect.objectContaining({ 'Index Name': 'units_pkey' })])
  })

  it('reads a batch of scans through indexes with the one plan the plain pool keeps', async () => {
    // The plain pool keeps a general plan per statement (server/db/pool.ts). Made while the test
    // database's tables are small, it must still find each row through its index: a plan that
    // scanned units or step_runs whole would go on doing so as they grow.
    const t = await lot(2)
    const serials = t.units.map((u) => u.serial)
    const client = await sqlPool().connect()
    const plan = await (async () => {
      try {
        const name = `read_plan_${uniqueSuffix().replace(/\W/g, '')}`
        await client.query(`PREPARE ${name}(text[], text[], uuid[], uuid[]) AS ${READ_SCANS.text}`)
        const args = [serials, ['WND-1', 'WND-1'], [randomUUID(), randomUUID()], [null, null]]
        const literal = (a: (string | null)[]) =>
          `'{${a.map((v) => (v === null ? 'NULL' : `"${v}"`)).join(',')}}'`
        const { rows } = await client.query<{ 'QUERY PLAN': { Plan: PlanNode }[] }>(
          `EXPLAIN (FORMAT JSON) EXECUTE ${name}(${args.map(literal).join(', ')})`,
        )
        await client.query(`DEALLOCATE ${name}`)
        return rows[0]!['QUERY PLAN'][0]!.Plan
      } finally {
        client.release()
      }
    })()
    const scans: PlanNode[] = []
    const walk = (node: PlanNode) => {
      if (node['Relation Name']) scans.push(node)
      for (const child of node.Plans ?? []) walk(child)
    }
    walk(plan)
    const on = (table: string) => scans.filter((n) => n['Relation Name'] === table)
    expect(on('units').map((n) => n['Index Name'])).toEqual(['units_serial_key'])
    expect(
      on('step_runs')
        .map((n) => n['Index Name'])
        .sort(),
    ).toEqual(['step_runs_client_event_id_key', 'step_runs_unit_id_step_id_attempt_key'])
    expect(scans.filter((n) => n['Node Type'] === 'Seq Scan')).toEqual([])
  })

  it('reworks a failed unit back to a chosen step, counting the rework and new attempts', async () => {
    const t = await lot(1)
    const serial = t.units[0]!.serial
    await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    const failed = await operator.post(
      '/api/step-runs',
      loadTestRun(serial, 340, { defectCodeId: defectId }),
    )
    expect(failed.body.stepRun.result).toBe('fail')
    const nc = failed.body.nonconformanceId
    const bad = await lead.post(`/api/nonconformances/${nc}/disposition`, {
      disposition: 'rework',
      reworkToStepId: randomUUID(),
    })
    expect(bad.body.fields).toHaveProperty('reworkToStepId')
    const windingStep = t.rev.steps[0]!.id
    const disposed = await lead.post(`/api/nonconformances/${nc}/disposition`, {
      disposition: 'rework',
      reworkToStepId: windingStep,
      reason: 'rewind secondary',
    })
    expect(disposed.body).toMatchObject({
      status: 'closed',
      disposition: 'rework',
      reworkToStepName: 'Winding',
      decidedBy: 'Dev Okafor',
    })
    const units = (await lead.get(`/api/lots/${t.lot.id}/units`)).body
    expect(units[0]).toMatchObject({
      state: 'in_rework',
      reworkCount: 1,
      currentStep: { name: 'Winding' },
    })
    const again = await operator.post('/api/step-runs', windingRun(t, serial))
    expect(again.body).toMatchObject({ stepRun: { attempt: 2 }, unit: { state: 'in_rework' } })
    const pass = await operator.post('/api/step-runs', loadTestRun(serial, 350))
    expect(pass.body).toMatchObject({
      stepRun: { attempt: 2, result: 'pass' },
      unit: { state: 'passed' },
    })
    const grid = (await lead.get(`/api/lots/${t.lot.id}/grid`)).body
    expect(grid.units[0].cells).toEqual(['passed_after_rework', 'passed_after_rework'])
    expect(
      (await lead.post(`/api/nonconformances/${nc}/disposition`, { disposition: 'scrap' })).status,
    ).toBe(409)
  })

  it('lets a unit be used as is only with a reason and an engineer’s signature', async () => {
    const t = await lot(1)
    const serial = t.units[0]!.serial
    await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    const nc = (
      await operator.post('/api/step-runs', loadTestRun(serial, 356, { defectCodeId: defectId }))
    ).body.nonconformanceId
    expect(
      (
        await lead.post(`/api/nonconformances/${nc}/disposition`, {
          disposition: 'use_as_is',
          reason: 'short',
        })
      ).body.fields,
    ).toHaveProperty('reason')
    const reason = 'output 1 V over; customer accepts per deviation note'
    const unsigned = await lead.post(`/api/nonconformances/${nc}/disposition`, {
      disposition: 'use_as_is',
      reason,
    })
    expect(unsigned.body.fields).toHaveProperty('countersign')
    const wrongRole = await lead.post(`/api/nonconformances/${nc}/disposition`, {
      disposition: 'use_as_is',
      reason,
      countersign: { email: 'operator@ferncastle.example', password: 'waymark-demo' },
    })
    expect(wrongRole.body.fields.countersign).toMatch(/engineer/)
    const ok = await lead.post(`/api/nonconformances/${nc}/disposition`, {
      disposition: 'use_as_is',
      reason,
      countersign: { email: 'engineer@ferncastle.example', password: 'waymark-demo' },
    })
    expect(ok.body).toMatchObject({ disposition: 'use_as_is', countersignedBy: 'Imogen Tarrant' })
    expect((await lead.get(`/api/lots/${t.lot.id}/units`)).body[0].state).toBe('passed')
    expect(
      (await operator.post(`/api/nonconformances/${nc}/disposition`, { disposition: 'scrap' }))
        .status,
    ).toBe(403)
  })

  it('shows the grid cells, WIP and the station’s recent runs', async () => {
    const t = await lot(2)
    await operator.post('/api/step-runs', windingRun(t, t.units[0]!.serial)).expect(201)
    const grid = (await lead.get(`/api/lots/${t.lot.id}/grid`)).body
    expect(grid.steps.map((s: { name: string }) => s.name)).toEqual(['Winding', 'Load test'])
    expect(grid.units.map((u: { cells: string[] }) => u.cells)).toEqual([
      ['passed_first', 'in_progress'],
      ['not_reached', 'not_reached'],
    ])
    expect(grid.wip.map((w: { units: number }) => w.units)).toEqual([1, 1])
    const recent = (await operator.get('/api/floor/stations/WND-1/recent')).body
    expect(recent[0]).toMatchObject({
      serial: t.units[0]!.serial,
      result: 'pass',
      operatorName: 'Sina Marsh',
    })
    const preview = (
      await operator.get(
        `/api/floor/units/${encodeURIComponent(`http://h/u/${t.units[0]!.serial}`)}?station=WND-1`,
      )
    ).body
    expect(preview.refusal).toMatch(/is waiting for Load test; this is Winding bench 1/)
  })
})
