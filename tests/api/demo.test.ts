import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import type { AlertDto } from '../../shared/schemas/alerts'
import type { LotDto, UnitSummaryDto } from '../../shared/schemas/lots'
import type { ServiceCaseDto } from '../../shared/schemas/shipping'
import { formatSerial, isoYearWeek } from '../../shared/serials'
import { db } from '../../server/models'
import { demoClock } from '../../server/seed/demoClock'
import {
  DEMO_ALERT_LOTS,
  DEMO_ORDER_REFS,
  LOT_PLANS,
  MISCOUNTED_UNITS,
  SUSPECT_CORE_LOT,
} from '../../server/seed/demoPlans'
import { signedInRoles } from './support/client'

// The demo shop as `npm test` seeds it (server/seed/demoStory.ts): the story's lots, found by
// their order references, since other test files add lots of their own beside them.

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  db().query<T>(query, { type: QueryTypes.SELECT, replacements })

const ORDER_REFS = Object.values(DEMO_ORDER_REFS)

describe('the demo shop', () => {
  const { lead, service } = signedInRoles('lead', 'service')
  let lots: Map<string, LotDto>
  let anchor: Date

  beforeAll(async () => {
    const all = (await lead.get('/api/lots').expect(200)).body as LotDto[]
    // Only the seed's lots carry these references with the seed's own numbers (L-0001…L-0008).
    lots = new Map(
      all
        .filter((l) => ORDER_REFS.includes(l.orderRef as never) && /^L-000[1-8]$/.test(l.number))
        .map((l) => [l.orderRef, l]),
    )
    const [load] = await sql<{ after: { anchor: string } }>(
      `SELECT after FROM audit_events WHERE action = 'demo.load' ORDER BY id DESC LIMIT 1`,
    )
    anchor = new Date(load!.after.anchor)
  })

  const lot = (ref: string) => {
    const found = lots.get(ref)
    if (!found) throw new Error(`no demo lot ${ref}`)
    return found
  }
  const units = async (ref: string) =>
    (await lead.get(`/api/lots/${lot(ref).id}/units`).expect(200)).body as UnitSummaryDto[]

  it('has 8–12 lots of 10–60 units of both products, in the states of the story', async () => {
    expect(lots.size).toBe(ORDER_REFS.length)
    expect(lots.size).toBeGreaterThanOrEqual(8)
    expect(lots.size).toBeLessThanOrEqual(12)
    for (const l of lots.values()) {
      expect(l.quantity).toBeGreaterThanOrEqual(10)
      expect(l.quantity).toBeLessThanOrEqual(60)
    }
    expect(new Set([...lots.values()].map((l) => l.productCode))).toEqual(new Set(['FP24', 'FP12']))
    const status = (ref: string) => lot(ref).status
    expect(status(DEMO_ORDER_REFS.shipped)).toBe('closed')
    expect(status(DEMO_ORDER_REFS.shippedWithOpenReturn)).toBe('closed')
    expect(status(DEMO_ORDER_REFS.miscount)).toBe('closed')
    expect(status(DEMO_ORDER_REFS.hipot)).toBe('closed')
    expect(status(DEMO_ORDER_REFS.contained)).toBe('in_progress')
    expect(status(DEMO_ORDER_REFS.inProgress)).toBe('in_progress')
    expect(status(DEMO_ORDER_REFS.inProgressSmall)).toBe('in_progress')
    expect(status(DEMO_ORDER_REFS.planned)).toBe('planned')
    expect(await units(DEMO_ORDER_REFS.planned)).toEqual([])
  })

  it('shipped the clean lot and e-mailed its certificate, which the Outbox lists', async () => {
    const shippedUnits = await units(DEMO_ORDER_REFS.shipped)
    // Every unit went out; one came back (a return closed as no fault found).
    expect(shippedUnits.filter((u) => u.state === 'shipped')).toHaveLength(
      lot(DEMO_ORDER_REFS.shipped).quantity - 1,
    )
    expect(shippedUnits.filter((u) => u.state === 'returned')).toHaveLength(1)
    const [shipment] = await sql<{ id: string; customer: string }>(
      `SELECT DISTINCT s.id, c.name AS customer
         FROM shipments s JOIN customers c ON c.id = s.customer_id
         JOIN shipment_units su ON su.shipment_id = s.id JOIN units u ON u.id = su.unit_id
        WHERE u.lot_id = :lotId`,
      { lotId: lot(DEMO_ORDER_REFS.shipped).id },
    )
    expect(shipment?.customer).toBe('Halden Rail Systems')
    const [email] = await sql<{ id: string }>(
      `SELECT e.id FROM emails e JOIN documents d ON d.id::text = e.related_id::text
        WHERE e.related_entity = 'document' AND d.kind = 'certificate' AND d.shipment_id = :id`,
      { id: shipment!.id },
    )
    const inOutbox = (await service.get(`/api/outbox/${email!.id}`).expect(200)).body as {
      to: string[]
      attachments: { filename: string }[]
    }
    expect(inOutbox.to).toEqual(['purchasing@halden-rail.example'])
    expect(inOutbox.attachments.map((a) => a.filename)).toEqual([
      expect.stringMatching(/certificate\.pdf$/),
    ])
  })

  it('has returns, one of them open, on shipped units', async () => {
    const cases = (await service.get('/api/service-cases').expect(200)).body as ServiceCaseDto[]
    const demoSerials = new Set([
      ...(await units(DEMO_ORDER_REFS.shipped)).map((u) => u.serial),
      ...(await units(DEMO_ORDER_REFS.shippedWithOpenReturn)).map((u) => u.serial),
    ])
    const demoCases = cases.filter((c) => demoSerials.has(c.serial))
    expect(demoCases.length).toBeGreaterThanOrEqual(2)
    expect(demoCases.filter((c) => c.status === 'open')).toHaveLength(1)
  })

  it('caught the miscount at WND-2 and rewound the six at WND-1', async () => {
    const runs = await sql<{ serial: string; station: string; result: string; attempt: number }>(
      `SELECT u.serial, st.code AS station, sr.result, sr.attempt
         FROM step_runs sr JOIN units u ON u.id = sr.unit_id JOIN stations st ON st.id = sr.station_id
         JOIN route_steps rs ON rs.id = sr.step_id
        WHERE u.lot_id = :lotId AND rs.position = 1
        ORDER BY sr.finished_at, sr.id`,
      { lotId: lot(DEMO_ORDER_REFS.miscount).id },
    )
    expect(runs).toHaveLength(lot(DEMO_ORDER_REFS.miscount).quantity + MISCOUNTED_UNITS.length)
    const failed = runs.filter((r) => r.result === 'fail')
    expect(failed).toHaveLength(MISCOUNTED_UNITS.length)
    expect(new Set(failed.map((r) => r.station))).toEqual(new Set(['WND-2']))
    // Units 11–16 in build order are the six; their second winding passed at WND-1.
    expect(runs.slice(10, 16).every((r) => r.result === 'fail')).toBe(true)
    const rewound = runs.filter((r) => failed.some((f) => f.serial === r.serial) && r.attempt > 1)
    expect(rewound.map((r) => [r.station, r.result])).toEqual(
      MISCOUNTED_UNITS.map(() => ['WND-1', 'pass']),
    )
    const ncs = await sql<{ disposition: string; code: string }>(
      `SELECT nc.disposition, dc.code FROM nonconformances nc JOIN units u ON u.id = nc.unit_id
         JOIN defect_codes dc ON dc.id = nc.defect_code_id WHERE u.lot_id = :lotId`,
      { lotId: lot(DEMO_ORDER_REFS.miscount).id },
    )
    expect(ncs).toEqual(MISCOUNTED_UNITS.map(() => ({ disposition: 'rework', code: 'W-TURNS' })))
  })

  it('has a lot with a hipot failure, a scrap and a use-as-is', async () => {
    const ncs = await sql<{ disposition: string; code: string; step: string }>(
      `SELECT nc.disposition, dc.code, rs.name AS step FROM nonconformances nc
         JOIN units u ON u.id = nc.unit_id JOIN defect_codes dc ON dc.id = nc.defect_code_id
         JOIN step_runs sr ON sr.id = nc.step_run_id JOIN route_steps rs ON rs.id = sr.step_id
        WHERE u.lot_id = :lotId ORDER BY nc.opened_at`,
      { lotId: lot(DEMO_ORDER_REFS.hipot).id },
    )
    expect(ncs).toEqual([
      { disposition: 'scrap', code: 'H-BREAK', step: 'Hipot' },
      { disposition: 'rework', code: 'H-LEAK', step: 'Hipot' },
      { disposition: 'use_as_is', code: 'I-COSMETIC', step: 'Final inspection' },
    ])
    const states = (await units(DEMO_ORDER_REFS.hipot)).map((u) => u.state)
    expect(states.filter((s) => s === 'scrapped')).toHaveLength(1)
    expect(states.filter((s) => s === 'shipped')).toHaveLength(states.length - 1)
  })

  it('holds every unit of the lot wound on the suspect core lot under its containment', async () => {
    const held = await units(DEMO_ORDER_REFS.contained)
    expect(held.length).toBe(lot(DEMO_ORDER_REFS.contained).quantity)
    expect(held.every((u) => u.state === 'on_hold')).toBe(true)
    const rows = await sql<{ hold_kind: string; n: string }>(
      `SELECT hold_kind, count(*) AS n FROM units WHERE lot_id = :lotId GROUP BY hold_kind`,
      { lotId: lot(DEMO_ORDER_REFS.contained).id },
    )
    expect(rows).toEqual([{ hold_kind: 'containment', n: String(held.length) }])
    const [core] = await sql<{ status: string }>(
      `SELECT status FROM component_lots WHERE supplier_lot_code = :code`,
      { code: SUSPECT_CORE_LOT },
    )
    expect(core?.status).toBe('quarantined')
  })

  it('has two lots in progress spread across the stations', async () => {
    for (const ref of [DEMO_ORDER_REFS.inProgress, DEMO_ORDER_REFS.inProgressSmall]) {
      const open = (await units(ref)).filter((u) => u.currentStep)
      const steps = new Set(open.map((u) => u.currentStep!.name))
      expect(steps.size, ref).toBeGreaterThanOrEqual(3)
    }
  })

  it('reads with spread: no numeric check series repeats a value twice in a row', async () => {
    // A series is one lot's values of one check in the order they were recorded, as the
    // statistics read it. Exact counts (lower = upper, such as turns counted) cannot vary.
    const rows = await sql<{
      series: string
      points: string
      repeats: string
      distinct: string
      decimals: number
    }>(
      `WITH v AS (
         SELECT u.lot_id, m.check_id, c.decimals, m.value_number AS value,
                lag(m.value_number) OVER (PARTITION BY u.lot_id, m.check_id
                                          ORDER BY sr.finished_at, sr.id) AS previous
           FROM step_runs sr JOIN units u ON u.id = sr.unit_id
           JOIN measurements m ON m.step_run_id = sr.id JOIN checks c ON c.id = m.check_id
          WHERE u.lot_id IN (:lotIds) AND m.value_number IS NOT NULL
            AND c.kind = 'numeric' AND c.lower IS DISTINCT FROM c.upper)
       SELECT lot_id || ':' || check_id AS series, decimals, count(*) AS points,
              count(*) FILTER (WHERE value = previous) AS repeats,
              count(DISTINCT value) AS distinct
         FROM v GROUP BY lot_id, check_id, decimals`,
      { lotIds: [...lots.values()].map((l) => l.id) },
    )
    expect(rows.length).toBeGreaterThan(50)
    expect(rows.filter((r) => Number(r.repeats) > 0)).toEqual([])
    // Long series of fine readings take three values or more, not two that alternate (a
    // set-point such as the load current may sit on a few); inductances, which carry each
    // core's own AL and the meter's noise, take at least as many values as half their points.
    for (const r of rows.filter((r) => Number(r.points) >= 10 && r.decimals >= 1))
      expect(Number(r.distinct), r.series).toBeGreaterThanOrEqual(3)
    const inductances = await sql<{ points: string; distinct: string }>(
      `SELECT count(*) AS points, count(DISTINCT m.value_number) AS distinct
         FROM step_runs sr JOIN units u ON u.id = sr.unit_id
         JOIN measurements m ON m.step_run_id = sr.id JOIN checks c ON c.id = m.check_id
        WHERE u.lot_id IN (:lotIds) AND c.key = 'l_secondary'
        GROUP BY u.lot_id`,
      { lotIds: [...lots.values()].map((l) => l.id) },
    )
    expect(inductances.length).toBeGreaterThanOrEqual(6)
    for (const r of inductances)
      expect(Number(r.distinct)).toBeGreaterThanOrEqual(Number(r.points) / 2)
  })

  it('dates every step run on a working day in shift hours, over at least five weeks', async () => {
    const runs = await sql<{ at: Date }>(
      `SELECT sr.finished_at AS at FROM step_runs sr JOIN units u ON u.id = sr.unit_id
        WHERE u.lot_id IN (:lotIds)`,
      { lotIds: [...lots.values()].map((l) => l.id) },
    )
    expect(runs.length).toBeGreaterThan(300)
    const times = runs.map((r) => new Date(r.at))
    const bad = times.filter((t) => {
      const day = t.getUTCDay()
      const minutes = t.getUTCHours() * 60 + t.getUTCMinutes()
      return day === 0 || day === 6 || minutes < 6 * 60 || minutes >= 22 * 60
    })
    expect(bad).toEqual([])
    const first = Math.min(...times.map((t) => t.getTime()))
    const last = Math.max(...times.map((t) => t.getTime()))
    expect(last - first).toBeGreaterThanOrEqual(35 * 86_400_000)
    expect(last).toBeLessThan(anchor.getTime())
    expect(anchor.getTime()).toBeLessThanOrEqual(Date.now())
  })

  it('wrote the audit rows the services write, at the times of the story', async () => {
    const lotIds = [...lots.values()].map((l) => l.id)
    const [counts] = await sql<Record<string, string>>(
      `SELECT
         count(*) FILTER (WHERE action = 'lot.create' AND entity_id IN (:lotIds)) AS created,
         count(*) FILTER (WHERE action = 'lot.release' AND entity_id IN (:lotIds)) AS released,
         count(*) FILTER (WHERE action = 'lot.close' AND entity_id IN (:lotIds)) AS closed,
         count(*) FILTER (WHERE action = 'nonconformance.dispose') AS disposed,
         count(*) FILTER (WHERE action = 'component_lot.contain') AS contained,
         count(*) FILTER (WHERE action = 'shipment.create') AS shipments,
         count(*) FILTER (WHERE action = 'service_case.open') AS returns
       FROM audit_events`,
      { lotIds },
    )
    expect(Number(counts!.created)).toBe(lots.size)
    expect(Number(counts!.released)).toBe(lots.size - 1)
    expect(Number(counts!.closed)).toBe(4)
    expect(Number(counts!.disposed)).toBeGreaterThanOrEqual(MISCOUNTED_UNITS.length + 3)
    expect(Number(counts!.contained)).toBeGreaterThanOrEqual(1)
    expect(Number(counts!.shipments)).toBeGreaterThanOrEqual(3)
    expect(Number(counts!.returns)).toBeGreaterThanOrEqual(2)
    // One step_run.record row per run of the demo lots, stamped with the run's own time.
    const [runs] = await sql<{ runs: string; audited: string }>(
      `SELECT (SELECT count(*) FROM step_runs sr JOIN units u ON u.id = sr.unit_id
                WHERE u.lot_id IN (:lotIds)) AS runs,
              (SELECT count(*) FROM audit_events a JOIN units u ON u.id::text = a.entity_id
                 JOIN step_runs sr ON sr.unit_id = u.id AND sr.finished_at = a.at
                WHERE a.action = 'step_run.record' AND u.lot_id IN (:lotIds)) AS audited`,
      { lotIds },
    )
    expect(Number(runs!.audited)).toBe(Number(runs!.runs))
    const releases = await sql<{ at: Date; released_at: Date }>(
      `SELECT a.at, l.released_at FROM audit_events a JOIN lots l ON l.id::text = a.entity_id
        WHERE a.action = 'lot.release' AND l.id IN (:lotIds)`,
      { lotIds },
    )
    for (const r of releases) expect(new Date(r.at)).toEqual(new Date(r.released_at))
  })

  it('is deterministic: the plan and the anchor give the same release times and serials', async () => {
    const clock = demoClock(anchor)
    const taken = new Map<string, number>()
    for (const plan of Object.values(LOT_PLANS)) {
      const l = lot(plan.orderRef)
      if (!plan.released) {
        expect(l.releasedAt).toBeNull()
        continue
      }
      const at = clock.at(plan.released.day, plan.released.minute)
      expect(l.releasedAt).toBe(at.toISOString())
      // Serials run on per product and ISO week, in the order the lots were released.
      const week = `${plan.productCode}:${isoYearWeek(at)}`
      const before = taken.get(week) ?? 0
      taken.set(week, before + plan.quantity)
      const expected = Array.from({ length: plan.quantity }, (_, i) =>
        formatSerial(plan.productCode, isoYearWeek(at), before + i + 1),
      )
      expect((await units(plan.orderRef)).map((u) => u.serial).sort()).toEqual(expected.sort())
    }
  })

  it('opens at most five alerts, each on a lot whose story raises one', async () => {
    // Open or since acknowledged: the alert tests acknowledge every open alert of this database.
    const open = (await lead.get('/api/alerts').expect(200)).body as AlertDto[]
    const demoLotIds = new Map([...lots.values()].map((l) => [l.id, l.orderRef]))
    const onDemoLots = open.filter((a) => demoLotIds.has(a.lotId))
    const stray = onDemoLots.filter((a) => !DEMO_ALERT_LOTS.includes(demoLotIds.get(a.lotId)!))
    expect(stray.map((a) => `${a.lotNumber} ${a.stepName}: ${a.headline}`)).toEqual([])
    expect(onDemoLots.length).toBeGreaterThanOrEqual(1)
    expect(onDemoLots.length).toBeLessThanOrEqual(5)
    // The miscount is among them, named by its bench and its size (two turns; the estimate from
    // inductance is coarser, as it carries the core's AL tolerance).
    const miscount = onDemoLots.filter(
      (a) => a.lotId === lot(DEMO_ORDER_REFS.miscount).id && a.details.kind === 'run_rule',
    )
    expect(miscount.length).toBeGreaterThanOrEqual(1)
    for (const a of miscount)
      expect(a.summary).toMatch(/^Winding bench 2: .* about (1\.[5-9]|2|2\.[0-4]) turns over/)
  })

  it('raises no turn-count alert for a shift of less than half a turn', async () => {
    // Half a turn: less rounds to the nominal count (DESIGN.md §7); common practice, no source.
    const all = (await lead.get('/api/alerts').expect(200)).body as AlertDto[]
    const turnAlerts = all.filter((a) => a.details.kind === 'run_rule' && a.checkUnit === 'turns')
    expect(turnAlerts.length).toBeGreaterThanOrEqual(1)
    for (const a of turnAlerts)
      if (a.details.kind === 'run_rule') expect(a.details.shift).toBeGreaterThanOrEqual(0.5)
  })

  it("stamps alerts, documents and e-mails, and their audit rows, with the story's time", async () => {
    const lotIds = [...lots.values()].map((l) => l.id)
    const alerts = await sql<{ id: string; created_at: Date; ended_at: Date | null }>(
      `SELECT id, created_at, ended_at FROM alerts WHERE lot_id IN (:lotIds)`,
      { lotIds },
    )
    expect(alerts.length).toBeGreaterThanOrEqual(1)
    for (const a of alerts) {
      expect(new Date(a.created_at).getTime()).toBeLessThan(anchor.getTime())
      if (a.ended_at) expect(new Date(a.ended_at).getTime()).toBeLessThan(anchor.getTime())
      const [raised] = await sql<{ at: Date }>(
        `SELECT at FROM audit_events WHERE action = 'alert.raise' AND entity_id = :id`,
        { id: a.id },
      )
      expect(new Date(raised!.at)).toEqual(new Date(a.created_at))
    }
    // The lead was told of the first alert by an e-mail queued when it was raised (later ones
    // within the digest window wait for the window's end, in the story's time too).
    const [told] = await sql<{ first: Date; last: Date }>(
      `SELECT min(n.mailed_at) AS first, max(n.mailed_at) AS last
         FROM alert_notices n JOIN alerts a ON a.id = n.alert_id WHERE a.lot_id IN (:lotIds)`,
      { lotIds },
    )
    const firstRaised = Math.min(...alerts.map((a) => new Date(a.created_at).getTime()))
    expect(new Date(told!.first).getTime()).toBe(firstRaised)
    expect(new Date(told!.last).getTime()).toBeLessThan(anchor.getTime())
    // The shipments' papers: asked for, made and e-mailed after packing, all before the anchor.
    const papers = await sql<{
      shipped: Date
      kind: string
      created_at: Date
      finished_at: Date | null
      requested: Date
      emailed: Date | null
      email_audit: Date | null
    }>(
      `SELECT s.created_at AS shipped, d.kind, d.created_at, d.finished_at,
              (SELECT a.at FROM audit_events a WHERE a.action = 'document.request'
                AND a.entity_id = d.id::text) AS requested,
              e.created_at AS emailed,
              (SELECT a.at FROM audit_events a WHERE a.action = 'email.queue'
                AND a.entity_id = e.id::text) AS email_audit
         FROM documents d JOIN shipments s ON s.id = d.shipment_id
         LEFT JOIN emails e ON e.related_entity = 'document' AND e.related_id = d.id
        WHERE s.order_ref IN (:refs)`,
      { refs: ORDER_REFS },
    )
    expect(
      papers.filter((p) => p.kind === 'certificate' && p.emailed).length,
    ).toBeGreaterThanOrEqual(3)
    for (const p of papers) {
      const shipped = new Date(p.shipped).getTime()
      expect(new Date(p.created_at).getTime()).toBeGreaterThanOrEqual(shipped)
      expect(new Date(p.requested)).toEqual(new Date(p.created_at))
      expect(new Date(p.finished_at!).getTime()).toBeLessThan(anchor.getTime())
      if (!p.emailed) continue
      expect(new Date(p.emailed).getTime()).toBeGreaterThan(new Date(p.created_at).getTime())
      expect(new Date(p.emailed).getTime()).toBeLessThan(anchor.getTime())
      expect(new Date(p.email_audit!)).toEqual(new Date(p.emailed))
    }
  })
})
