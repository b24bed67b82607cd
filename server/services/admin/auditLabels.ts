import { containsPattern } from '../../../shared/searchTerms'
import { isAuditedEntity } from '../../../shared/audit'
import type { AuditedEntity } from '../../../shared/audit'
import { select } from '../../db/sql'

/**
 * How each kind of record the audit log names reads to a person: one SELECT per entity that
 * gives `id` (as text, the way `audit_events.entity_id` holds it) and `label`. Kept beside the
 * audit list, which is its only reader; a new audited entity adds a line here.
 */
const LABEL_SQL: Record<AuditedEntity, string> = {
  unit: 'SELECT id::text AS id, serial AS label FROM units',
  lot: `SELECT id::text AS id, 'lot ' || number AS label FROM lots`,
  component_lot: `SELECT id::text AS id, internal_code || ' (' || supplier_lot_code || ')' AS label FROM component_lots`,
  product: `SELECT id::text AS id, code || ' ' || name AS label FROM products`,
  revision: `SELECT r.id::text AS id, p.code || ' rev ' || r.letter AS label
               FROM revisions r JOIN products p ON p.id = r.product_id`,
  check: `SELECT c.id::text AS id, c.label || ' (' || p.code || ' rev ' || r.letter || ')' AS label
            FROM checks c JOIN revisions r ON r.id = c.revision_id JOIN products p ON p.id = r.product_id`,
  route_step: `SELECT s.id::text AS id, s.name || ' (' || p.code || ' rev ' || r.letter || ')' AS label
           FROM route_steps s JOIN revisions r ON r.id = s.revision_id JOIN products p ON p.id = r.product_id`,
  winding: `SELECT w.id::text AS id, w.name || ' winding (' || p.code || ' rev ' || r.letter || ')' AS label
              FROM windings w JOIN revisions r ON r.id = w.revision_id JOIN products p ON p.id = r.product_id`,
  bom_line: `SELECT b.id::text AS id, pt.part_number || ' in ' || p.code || ' rev ' || r.letter AS label
               FROM bom_lines b JOIN parts pt ON pt.id = b.part_id
               JOIN revisions r ON r.id = b.revision_id JOIN products p ON p.id = r.product_id`,
  part: `SELECT id::text AS id, part_number AS label FROM parts`,
  customer: 'SELECT id::text AS id, name AS label FROM customers',
  shipment: 'SELECT id::text AS id, number AS label FROM shipments',
  service_case: 'SELECT id::text AS id, number AS label FROM service_cases',
  defect_code: 'SELECT id::text AS id, code AS label FROM defect_codes',
  station: `SELECT id::text AS id, code || ' ' || name AS label FROM stations`,
  user: 'SELECT id::text AS id, name AS label FROM users',
  document: 'SELECT id::text AS id, filename AS label FROM documents',
  email: 'SELECT id::text AS id, subject AS label FROM emails',
  import: 'SELECT id::text AS id, filename AS label FROM imports',
  alert: `SELECT a.id::text AS id, 'alert on lot ' || l.number AS label
            FROM alerts a JOIN lots l ON l.id = a.lot_id`,
  nonconformance: `SELECT n.id::text AS id, 'nonconformance on ' || u.serial AS label
                     FROM nonconformances n JOIN units u ON u.id = n.unit_id`,
}

/** The key of one record in the label map: its entity and id. */
export const labelKey = (entity: string, id: string) => `${entity}:${id}`

/** Labels of the given records, keyed by `labelKey`; records gone or of unknown kinds are left out. */
export async function recordLabels(
  refs: readonly { entity: string; entityId: string | null }[],
): Promise<Map<string, string>> {
  const byEntity = new Map<AuditedEntity, Set<string>>()
  for (const { entity, entityId } of refs) {
    if (!entityId || !isAuditedEntity(entity)) continue
    byEntity.set(entity, (byEntity.get(entity) ?? new Set()).add(entityId))
  }
  const labels = new Map<string, string>()
  await Promise.all(
    [...byEntity].map(async ([entity, ids]) => {
      const rows = await select<{ id: string; label: string | null }>(
        `SELECT id, label FROM (${LABEL_SQL[entity]}) t WHERE id IN (:ids)`,
        { replacements: { ids: [...ids] } },
      )
      for (const r of rows) if (r.label) labels.set(labelKey(entity, r.id), r.label)
    }),
  )
  return labels
}

/**
 * Records whose label contains `text` (case-insensitive), at most `limit` of each kind: what the
 * audit screen's "thing" filter means by "a serial, a lot, a code or a name".
 */
export async function recordsLabelled(
  text: string,
  limit = 200,
): Promise<{ entity: string; entityId: string }[]> {
  const pattern = containsPattern(text)
  const found = await Promise.all(
    Object.entries(LABEL_SQL).map(async ([entity, sql]) => {
      const rows = await select<{ id: string }>(
        `SELECT id FROM (${sql}) t WHERE label ILIKE :pattern LIMIT :limit`,
        { replacements: { pattern, limit } },
      )
      return rows.map((r) => ({ entity, entityId: r.id }))
    }),
  )
  return found.flat()
}
