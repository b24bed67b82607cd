import { randomUUID } from 'node:crypto'
import type pg from 'pg'
import { mod3736CheckCharacter } from '../../shared/checkCharacter'
import { formatSerial } from '../../shared/serials'
import { REBUILD_YIELD_ROLLUPS } from '../../server/db/yieldRollups'

export interface TraceBenchData {
  serials: string[]
  /** A component lot fitted in exactly `perLot` units. */
  hotLotCode: string
  unitsInHotLot: number
}

/**
 * Bulk-loads a traced history on top of the demo: `lots` lots of `lotSize` units of the demo's
 * released FP24 revision B, one passing step run per route step with every check measured,
 * every bill-of-materials line fitted from component lots of `perLot` units each, shipments of
 * most lots to eight customers, and the lots' documents. Arrays go in through unnest() and the
 * rest is INSERT … SELECT in the server, so 20 000 units load in seconds, not hours.
 */
export async function seedTraceHistory(
  client: pg.Client,
  opts: { lots: number; lotSize: number; perLot: number },
): Promise<TraceBenchData> {
  const q = async <T = Record<string, unknown>>(sql: string, params: unknown[] = []) =>
    (await client.query(sql, params)).rows as T[]
  const [rev] = await q<{ id: string; code: string }>(
    `SELECT r.id, p.code FROM revisions r JOIN products p ON p.id = r.product_id
     WHERE p.code = 'FP24' AND r.letter = 'B'`,
  )
  if (!rev) throw new Error('the demo has no FP24 revision B')
  const [operator] = await q<{ id: string }>(`SELECT id FROM users WHERE role = 'operator' LIMIT 1`)
  const total = opts.lots * opts.lotSize

  const lotIds: string[] = []
  const lotNumbers: string[] = []
  for (let l = 0; l < opts.lots; l++) {
    lotIds.push(randomUUID())
    lotNumbers.push(`BL-${String(l + 1).padStart(4, '0')}`)
  }
  await q(
    `INSERT INTO lots (id, number, revision_id, quantity, order_ref, customer_name, status,
       is_on_hold, hold_reason, released_at, created_at, updated_at)
     SELECT id, number, $3, $4, 'BENCH-' || number, '', 'in_progress', false, '', now(), now(), now()
     FROM unnest($1::uuid[], $2::text[]) AS t(id, number)`,
    [lotIds, lotNumbers, rev.id, opts.lotSize],
  )

  const unitIds: string[] = []
  const serials: string[] = []
  const unitLots: string[] = []
  const ordinals: number[] = []
  for (let i = 0; i < total; i++) {
    const lot = Math.floor(i / opts.lotSize)
    unitIds.push(randomUUID())
    // One ISO week per lot, weeks 01–40 of 2026: no clash with the demo's serials.
    serials.push(
      formatSerial(rev.code, `26${String(lot + 1).padStart(2, '0')}`, (i % opts.lotSize) + 1),
    )
    unitLots.push(lotIds[lot]!)
    ordinals.push(i)
  }
  await q(
    `INSERT INTO units (id, serial, lot_id, state, rework_count, hold_reason, created_at, updated_at)
     SELECT id, serial, lot_id, 'passed', 0, '', now(), now()
     FROM unnest($1::uuid[], $2::text[], $3::uuid[]) AS t(id, serial, lot_id)`,
    [unitIds, serials, unitLots],
  )
  await q(`CREATE TEMP TABLE bench_units (id uuid PRIMARY KEY, n int NOT NULL)`)
  await q(`INSERT INTO bench_units SELECT * FROM unnest($1::uuid[], $2::int[])`, [
    unitIds,
    ordinals,
  ])

  // One passing run per unit and step, five minutes each, at a station of the step's kind.
  await q(
    `INSERT INTO step_runs (id, unit_id, step_id, station_id, operator_id, attempt, is_rework,
       result, note, client_event_id, started_at, finished_at)
     SELECT gen_random_uuid(), bu.id, rs.id,
       coalesce((SELECT s.id FROM stations s WHERE s.kind = rs.station_kind ORDER BY s.code LIMIT 1),
                (SELECT s.id FROM stations s ORDER BY s.code LIMIT 1)),
       $2, 1, false, 'pass', '', gen_random_uuid(),
       timestamptz '2026-01-05 07:00Z' + (bu.n * interval '2 minutes') + (rs.position * interval '1 hour'),
       timestamptz '2026-01-05 07:05Z' + (bu.n * interval '2 minutes') + (rs.position * interval '1 hour')
     FROM bench_units bu CROSS JOIN route_steps rs WHERE rs.revision_id = $1`,
    [rev.id, operator!.id],
  )
  // Inserted in bulk, not by the scan: count the Yield board's rollups as the scan keeps them.
  for (const sql of REBUILD_YIELD_ROLLUPS) await q(sql)
  await q(
    `INSERT INTO measurements (step_run_id, check_id, value_number, value_text, value_boolean,
       is_derived, is_pass)
     SELECT sr.id, c.id,
       CASE WHEN c.kind = 'numeric' THEN coalesce(c.nominal, (c.lower + c.upper) / 2, c.lower, c.upper, 1) END,
       CASE WHEN c.kind IN ('text', 'choice') THEN coalesce(c.choices -> 0 ->> 'value', 'ok') END,
       CASE WHEN c.kind = 'boolean' THEN true END,
       c.derived IS NOT NULL, true
     FROM step_runs sr JOIN bench_units bu ON bu.id = sr.unit_id JOIN checks c ON c.step_id = sr.step_id`,
  )

  // Component lots: one per BOM part per `perLot` units, so lot k of a part is in units
  // [k·perLot, (k+1)·perLot).
  const lines = await q<{
    id: string
    part_id: string
    fitted: string | null
    serial_traced: boolean
  }>(
    `SELECT bl.id, bl.part_id, coalesce(bl.fitted_at_step_id,
       (SELECT id FROM route_steps WHERE revision_id = $1 ORDER BY position LIMIT 1)) AS fitted,
       bl.trace_level = 'serial' AS serial_traced
     FROM bom_lines bl WHERE bl.revision_id = $1 ORDER BY bl.position`,
    [rev.id],
  )
  const lotsPerPart = Math.ceil(total / opts.perLot)
  const clIds: string[] = []
  const clCodes: string[] = []
  const clParts: string[] = []
  let seq = 0
  const parts = [...new Set(lines.map((l) => l.part_id))]
  for (const part of parts)
    for (let k = 0; k < lotsPerPart; k++) {
      const body = `BN-26-${String(++seq).padStart(5, '0')}`
      clIds.push(randomUUID())
      clCodes.push(body + mod3736CheckCharacter(body))
      clParts.push(part)
    }
  // One supplier record for the bench's lots (suppliers are records, one per name).
  await q(
    `INSERT INTO suppliers (id, name, created_at, updated_at)
     VALUES (gen_random_uuid(), 'Bench Supplies', now(), now()) ON CONFLICT DO NOTHING`,
  )
  await q(
    `INSERT INTO component_lots (id, internal_code, part_id, supplier_id, supplier_lot_code,
       quantity_received, quantity_remaining, received_on, status, notes, created_at, updated_at)
     SELECT id, code, part_id,
       (SELECT id FROM suppliers WHERE lower(name) = 'bench supplies'), 'BS-' || code,
       100000, 50000, date '2026-01-02', 'available', '', now(), now()
     FROM unnest($1::uuid[], $2::text[], $3::uuid[]) AS t(id, code, part_id)`,
    [clIds, clCodes, clParts],
  )
  await q(`CREATE TEMP TABLE bench_cl (id uuid, part_id uuid, k int)`)
  await q(
    `INSERT INTO bench_cl SELECT id, part_id, (row_number() OVER (PARTITION BY part_id ORDER BY code)) - 1
     FROM unnest($1::uuid[], $2::text[], $3::uuid[]) AS t(id, code, part_id)`,
    [clIds, clCodes, clParts],
  )
  await q(
    `INSERT INTO consumptions (id, unit_id, component_lot_id, part_id, bom_line_id, step_run_id,
       quantity, item_serial, created_at)
     SELECT gen_random_uuid(), bu.id, cl.id, cl.part_id, bl.id, sr.id, bl.quantity,
       CASE WHEN bl.trace_level = 'serial' THEN u.serial END, sr.finished_at
     FROM bench_units bu
     JOIN units u ON u.id = bu.id
     JOIN bom_lines bl ON bl.revision_id = $1
     JOIN bench_cl cl ON cl.part_id = bl.part_id AND cl.k = bu.n / $2
     JOIN step_runs sr ON sr.unit_id = bu.id
       AND sr.step_id = coalesce(bl.fitted_at_step_id,
         (SELECT id FROM route_steps WHERE revision_id = $1 ORDER BY position LIMIT 1))`,
    [rev.id, opts.perLot],
  )

  // Eight customers; three lots in four ship, one shipment per lot; the lots' documents.
  await q(
    `INSERT INTO customers (id, name, contact_email, address, created_at, updated_at)
     SELECT gen_random_uuid(), 'Bench customer ' || g, 'buyer' || g || '@bench.example', '', now(), now()
     FROM generate_series(1, 8) g`,
  )
  await q(
    `INSERT INTO shipments (id, number, customer_id, order_ref, carrier, tracking, shipped_on,
       created_at, updated_at)
     SELECT gen_random_uuid(), 'BS-' || l.number, c.id, l.order_ref, 'Bench Freight',
       'BF' || l.number, date '2026-03-01', now(), now()
     FROM (SELECT number, order_ref, row_number() OVER (ORDER BY number) AS rn FROM lots
           WHERE number LIKE 'BL-%' AND right(number, 1) <> '4') l
     JOIN (SELECT id, row_number() OVER (ORDER BY name) - 1 AS k FROM customers
           WHERE name LIKE 'Bench customer %') c ON c.k = l.rn % 8`,
  )
  await q(
    `INSERT INTO shipment_units (unit_id, shipment_id, created_at)
     SELECT u.id, s.id, now() FROM units u JOIN lots l ON l.id = u.lot_id
     JOIN shipments s ON s.number = 'BS-' || l.number`,
  )
  await q(`UPDATE units SET state = 'shipped' WHERE id IN (SELECT unit_id FROM shipment_units)`)
  await q(
    `INSERT INTO documents (id, kind, lot_id, status, progress, filename, created_at, updated_at)
     SELECT gen_random_uuid(), k, l.id, 'done', 100, l.number || '-' || k || '.pdf', now(), now()
     FROM lots l CROSS JOIN (VALUES ('travelers'), ('labels')) AS v(k) WHERE l.number LIKE 'BL-%'`,
  )
  // As autovacuum would by now: statistics, and the visibility map index-only scans need.
  await q('VACUUM ANALYZE')
  return { serials, hotLotCode: clCodes[0]!, unitsInHotLot: Math.min(opts.perLot, total) }
}
