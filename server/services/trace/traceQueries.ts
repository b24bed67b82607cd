/**
 * The SQL behind Trace, kept apart from the mapping code so the benchmark runs the very same
 * text straight through pg. Each statement takes its key as `$1`.
 */

/**
 * Which documents belong to a unit `u` whose latest shipment is `sh`: its own certificates,
 * the papers of the shipment it went out in, and its lot's travelers and labels. The trace and
 * the unit's document panel (UNIT_DOCUMENTS_SQL) both read this one rule, so they never list
 * different papers for one serial.
 */
const UNIT_DOCUMENTS_MATCH = `(d.lot_id = u.lot_id AND d.unit_id IS NULL AND d.shipment_id IS NULL
          AND d.kind IN ('travelers', 'labels'))
      OR d.unit_id = u.id
      OR (sh.id IS NOT NULL AND d.shipment_id = sh.id)`

/** The latest shipment `sh` of unit `u`: a repaired unit can ship again. */
const LATEST_SHIPMENT = `LEFT JOIN LATERAL (
  SELECT s.* FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
   WHERE su.unit_id = u.id
   ORDER BY s.shipped_on DESC, su.created_at DESC
   LIMIT 1
) sh ON true`

/** The ids of a unit's documents (by serial), newest first; documents_{lot,unit,shipment}_idx. */
export const UNIT_DOCUMENTS_SQL = `
SELECT d.id FROM units u
${LATEST_SHIPMENT}
JOIN documents d ON ${UNIT_DOCUMENTS_MATCH}
WHERE u.serial = $1
ORDER BY d.created_at DESC, d.id`

/**
 * The units among `ids` with a return still open, and its number: a certificate issued for
 * such a unit vouches for one a customer has just sent back (service_cases_unit_idx).
 */
export const OPEN_RETURNS_SQL = `
SELECT u.serial, sc.number FROM service_cases sc JOIN units u ON u.id = sc.unit_id
WHERE sc.unit_id = ANY($1::uuid[]) AND sc.status = 'open'
ORDER BY u.serial, sc.number`

/**
 * A unit's whole history in one round trip: the header row joined from unit to product and
 * shipment, and each list as a JSON array built by a sub-select that reads one index
 * (step_runs' (unit_id, step_id, attempt), measurements' (step_run_id, check_id),
 * consumptions_unit_idx, nonconformances_unit_idx, documents_{lot,unit,shipment}_idx,
 * service_cases_unit_idx).
 */
export const UNIT_TRACE_SQL = `
SELECT
  u.id, u.serial, u.state, u.hold_reason, u.rework_count, u.created_at, u.finished_at,
  cs.name AS current_step_name,
  l.id AS lot_id, l.number AS lot_number, l.order_ref, l.released_at AS lot_released_at,
  coalesce(lc.name, l.customer_name) AS lot_customer_name,
  p.id AS product_id, p.code AS product_code, p.name AS product_name,
  r.id AS revision_id, r.letter AS revision_letter, r.status AS revision_status,
  r.released_at AS revision_released_at,
  sh.id AS shipment_id, sh.number AS shipment_number, sh.order_ref AS shipment_order_ref,
  sh.carrier, sh.tracking, sh.shipped_on, shc.id AS shipment_customer_id,
  shc.name AS shipment_customer_name, shc.contact_email AS shipment_customer_email,
  (SELECT coalesce(json_agg(json_build_object(
      'id', sr.id, 'stepId', sr.step_id, 'stepName', rs.name, 'stepPosition', rs.position,
      'stationKind', rs.station_kind, 'stationCode', st.code, 'stationName', st.name,
      'operator', op.name, 'countersignedBy', cu.name, 'attempt', sr.attempt,
      'isRework', sr.is_rework, 'result', sr.result, 'note', sr.note,
      'startedAt', sr.started_at, 'finishedAt', sr.finished_at,
      'values', (SELECT coalesce(json_agg(json_build_object(
          'key', c.key, 'label', c.label, 'unit', c.unit, 'kind', c.kind,
          'value', coalesce(to_jsonb(m.value_number), to_jsonb(m.value_boolean), to_jsonb(m.value_text)),
          'decimals', c.decimals, 'nominal', c.nominal, 'lower', c.lower, 'upper', c.upper,
          'isPass', m.is_pass, 'isDerived', m.is_derived) ORDER BY c.position, c.key), '[]')
        FROM measurements m JOIN checks c ON c.id = m.check_id WHERE m.step_run_id = sr.id)
    ) ORDER BY sr.finished_at, sr.started_at), '[]')
   FROM step_runs sr
   JOIN route_steps rs ON rs.id = sr.step_id
   JOIN stations st ON st.id = sr.station_id
   JOIN users op ON op.id = sr.operator_id
   LEFT JOIN users cu ON cu.id = sr.countersigned_by
   WHERE sr.unit_id = u.id) AS step_runs,
  (SELECT coalesce(json_agg(json_build_object(
      'id', co.id, 'stepRunId', co.step_run_id, 'componentLotId', cl.id,
      'internalCode', cl.internal_code, 'partNumber', pa.part_number,
      'partDescription', pa.description, 'supplierName', su.name,
      'supplierLotCode', cl.supplier_lot_code, 'componentLotStatus', cl.status,
      'quantity', co.quantity, 'unitOfMeasure', pa.unit_of_measure, 'itemSerial', co.item_serial,
      'refDesignators', bl.ref_designators, 'certificateFilename', up.filename,
      'fittedAt', co.created_at) ORDER BY co.created_at, pa.part_number), '[]')
   FROM consumptions co
   JOIN component_lots cl ON cl.id = co.component_lot_id
   JOIN parts pa ON pa.id = cl.part_id
   JOIN suppliers su ON su.id = cl.supplier_id
   JOIN bom_lines bl ON bl.id = co.bom_line_id
   LEFT JOIN uploads up ON up.id = cl.certificate_upload_id
   WHERE co.unit_id = u.id) AS consumptions,
  (SELECT coalesce(json_agg(json_build_object(
      'id', nc.id, 'stepRunId', nc.step_run_id, 'stepName', nrs.name,
      'defectCode', dc.code, 'defectDescription', dc.description,
      'description', nc.description, 'failedChecks', nc.failed_checks,
      'disposition', nc.disposition, 'reworkToStepName', rts.name, 'reason', nc.reason,
      'openedBy', ob.name, 'decidedBy', db.name, 'countersignedBy', ncs.name,
      'openedAt', nc.opened_at, 'closedAt', nc.closed_at) ORDER BY nc.opened_at), '[]')
   FROM nonconformances nc
   JOIN step_runs nsr ON nsr.id = nc.step_run_id
   JOIN route_steps nrs ON nrs.id = nsr.step_id
   LEFT JOIN defect_codes dc ON dc.id = nc.defect_code_id
   LEFT JOIN route_steps rts ON rts.id = nc.rework_to_step_id
   LEFT JOIN users ob ON ob.id = nc.opened_by
   LEFT JOIN users db ON db.id = nc.decided_by
   LEFT JOIN users ncs ON ncs.id = nc.countersigned_by
   WHERE nc.unit_id = u.id) AS nonconformances,
  (SELECT coalesce(json_agg(json_build_object(
      'id', d.id, 'kind', d.kind, 'filename', d.filename, 'status', d.status,
      'createdAt', d.created_at) ORDER BY d.created_at), '[]')
   FROM documents d
   WHERE ${UNIT_DOCUMENTS_MATCH}) AS documents,
  (SELECT coalesce(json_agg(json_build_object(
      'id', sc.id, 'number', sc.number, 'status', sc.status, 'customerName', scc.name,
      'complaint', sc.complaint, 'receivedOn', sc.received_on, 'findings', sc.findings,
      'defectCode', scd.code, 'resolution', sc.resolution, 'replacementSerial', ru.serial,
      'openedBy', sco.name, 'closedAt', sc.closed_at) ORDER BY sc.received_on, sc.created_at), '[]')
   FROM service_cases sc
   LEFT JOIN customers scc ON scc.id = sc.customer_id
   LEFT JOIN defect_codes scd ON scd.id = sc.defect_code_id
   LEFT JOIN units ru ON ru.id = sc.replacement_unit_id
   LEFT JOIN users sco ON sco.id = sc.opened_by
   WHERE sc.unit_id = u.id) AS service_cases
FROM units u
JOIN lots l ON l.id = u.lot_id
JOIN revisions r ON r.id = l.revision_id
JOIN products p ON p.id = r.product_id
LEFT JOIN customers lc ON lc.id = l.customer_id
LEFT JOIN route_steps cs ON cs.id = u.current_step_id
-- A repaired unit can ship again: its latest shipment is where it is now.
LEFT JOIN LATERAL (
  SELECT s.* FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
   WHERE su.unit_id = u.id
   ORDER BY s.shipped_on DESC, su.created_at DESC
   LIMIT 1
) sh ON true
LEFT JOIN customers shc ON shc.id = sh.customer_id
WHERE u.serial = $1`

/**
 * Every unit holding a component lot (by its internal code), with its lot, shipment and
 * customer: consumptions_lot_units_idx finds the units from the index alone, the rest are joins
 * on primary keys. A unit that took two pieces of the lot is one row with the summed quantity.
 */
export const RECALL_SCOPE_SQL = `
SELECT u.id AS unit_id, u.serial, u.state, u.held_from_state, u.hold_kind, l.number AS lot_number,
  coalesce(shc.id, lc.id) AS customer_id,
  coalesce(shc.name, lc.name, nullif(l.customer_name, ''), '') AS customer_name,
  coalesce(shc.contact_email, lc.contact_email, '') AS contact_email,
  sh.number AS shipment_number, sh.shipped_on, q.quantity
FROM (
  SELECT co.unit_id, sum(co.quantity) AS quantity
  FROM consumptions co JOIN component_lots cl ON cl.id = co.component_lot_id
  WHERE cl.internal_code = $1
  GROUP BY co.unit_id
) q
JOIN units u ON u.id = q.unit_id
JOIN lots l ON l.id = u.lot_id
LEFT JOIN customers lc ON lc.id = l.customer_id
-- A repaired unit can ship again: its latest shipment is where it is now.
LEFT JOIN LATERAL (
  SELECT s.* FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
   WHERE su.unit_id = u.id
   ORDER BY s.shipped_on DESC, su.created_at DESC
   LIMIT 1
) sh ON true
LEFT JOIN customers shc ON shc.id = sh.customer_id
ORDER BY u.serial`
