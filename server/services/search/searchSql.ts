import type { SearchKind } from '../../../shared/schemas/search'
import { SEARCH_HITS_PER_KIND } from '../../../shared/schemas/search'

/**
 * One SELECT per kind of record, all with the same columns so the search runs as one UNION ALL
 * statement (one round trip): `kind`, `id`, `title`, `ref`, `rank` (lower first) and `info`,
 * a JSON object of what the detail line is made from. Each picks its few rows by index in an
 * inner query first, then joins only those.
 *
 * Replacements: `:pattern` (ILIKE, anywhere; served by the trigram indexes of migration
 * 20261205120100), `:upper` (the text upper-cased, for exact matches first), `:serials` (the
 * serials the text can only mean; `searchTerms`), `:revCode`/`:revLetter`, `:drafts`.
 */
const LIMIT = SEARCH_HITS_PER_KIND

/** Units whose serial the text names exactly (check character added or corrected). */
const UNIT_EXACT = `
  SELECT 'unit', u.id::text, u.serial::text, u.serial::text,
         array_position(ARRAY[:serials]::text[], u.serial::text),
         jsonb_build_object('state', u.state, 'lot', l.number, 'product', p.code, 'letter', r.letter,
                            'exact', true)
    FROM units u JOIN lots l ON l.id = u.lot_id
    JOIN revisions r ON r.id = l.revision_id JOIN products p ON p.id = r.product_id
   WHERE u.serial IN (:serials)`

/** Units with the text anywhere in their serial, newest week and sequence first. */
const UNIT_CONTAINS = `
  SELECT 'unit', u.id::text, u.serial::text, u.serial::text, 100,
         jsonb_build_object('state', u.state, 'lot', l.number, 'product', p.code, 'letter', r.letter,
                            'exact', false)
    FROM (SELECT id, serial, lot_id, state FROM units WHERE serial ILIKE :pattern
           ORDER BY serial DESC LIMIT ${LIMIT}) u
    JOIN lots l ON l.id = u.lot_id
    JOIN revisions r ON r.id = l.revision_id JOIN products p ON p.id = r.product_id`

const LOT = `
  SELECT 'lot', l.id::text, l.number::text, l.id::text,
         CASE WHEN upper(l.number) = :upper THEN 0 ELSE 1 END,
         jsonb_build_object('status', l.status, 'quantity', l.quantity, 'product', p.code,
                            'letter', r.letter, 'orderRef', l.order_ref,
                            'customer', coalesce(c.name, l.customer_name))
    FROM (SELECT * FROM lots WHERE number ILIKE :pattern OR order_ref ILIKE :pattern
           ORDER BY upper(number) = :upper DESC, created_at DESC LIMIT ${LIMIT}) l
    JOIN revisions r ON r.id = l.revision_id JOIN products p ON p.id = r.product_id
    LEFT JOIN customers c ON c.id = l.customer_id`

const COMPONENT_LOT = `
  SELECT 'componentLot', cl.id::text, cl.internal_code::text, cl.internal_code::text,
         CASE WHEN upper(cl.internal_code) = :upper OR upper(cl.supplier_lot_code) = :upper
              THEN 0 ELSE 1 END,
         jsonb_build_object('part', pt.part_number, 'supplier', su.name,
                            'supplierLot', cl.supplier_lot_code, 'status', cl.status)
    FROM (SELECT * FROM component_lots
           WHERE internal_code ILIKE :pattern OR supplier_lot_code ILIKE :pattern
           ORDER BY upper(internal_code) = :upper OR upper(supplier_lot_code) = :upper DESC,
                    received_on DESC, internal_code DESC LIMIT ${LIMIT}) cl
    JOIN parts pt ON pt.id = cl.part_id
    JOIN suppliers su ON su.id = cl.supplier_id`

const CUSTOMER = `
  SELECT 'customer', c.id::text, c.name::text, c.id::text,
         CASE WHEN upper(c.name) = :upper THEN 0 ELSE 1 END,
         jsonb_build_object('email', c.contact_email)
    FROM customers c
   WHERE c.name ILIKE :pattern OR c.contact_email ILIKE :pattern
   ORDER BY upper(c.name) = :upper DESC, c.name LIMIT ${LIMIT}`

/** A product's revisions, by code or name, or `FP24 B`; drafts only when `:drafts`. */
const REVISION = `
  SELECT 'revision', r.id::text, p.code || ' rev ' || r.letter, r.id::text,
         CASE WHEN p.code = :revCode AND r.letter = :revLetter THEN 0 ELSE 1 END,
         jsonb_build_object('name', p.name, 'status', r.status)
    FROM revisions r JOIN products p ON p.id = r.product_id
   WHERE (p.code ILIKE :pattern OR p.name ILIKE :pattern
          OR (p.code = :revCode AND r.letter = :revLetter))
     AND (:drafts OR r.status <> 'draft')
   ORDER BY p.code = :revCode AND r.letter = :revLetter DESC, p.code, r.letter DESC
   LIMIT ${LIMIT}`

const SHIPMENT = `
  SELECT 'shipment', s.id::text, s.number::text, s.id::text,
         CASE WHEN upper(s.number) = :upper THEN 0 ELSE 1 END,
         jsonb_build_object('customer', c.name, 'shippedOn', s.shipped_on, 'orderRef', s.order_ref,
                            'tracking', s.tracking)
    FROM (SELECT * FROM shipments
           WHERE number ILIKE :pattern OR order_ref ILIKE :pattern OR tracking ILIKE :pattern
           ORDER BY upper(number) = :upper DESC, shipped_on DESC, number DESC LIMIT ${LIMIT}) s
    JOIN customers c ON c.id = s.customer_id`

/** Returns by number, and the return of a unit the text names exactly. */
const SERVICE_CASE = `
  SELECT 'serviceCase', sc.id::text, sc.number::text, sc.id::text,
         CASE WHEN upper(sc.number) = :upper OR u.serial IN (:serials) THEN 0 ELSE 1 END,
         jsonb_build_object('serial', u.serial, 'status', sc.status, 'customer', c.name,
                            'receivedOn', sc.received_on)
    FROM (SELECT * FROM service_cases
           WHERE number ILIKE :pattern
              OR unit_id IN (SELECT id FROM units WHERE serial IN (:serials))
           ORDER BY received_on DESC, number DESC LIMIT ${LIMIT}) sc
    JOIN units u ON u.id = sc.unit_id LEFT JOIN customers c ON c.id = sc.customer_id`

/** The SELECTs that find each kind; a kind may take more than one. */
export const SEARCH_SELECTS: Record<SearchKind, readonly string[]> = {
  unit: [UNIT_EXACT, UNIT_CONTAINS],
  lot: [LOT],
  componentLot: [COMPONENT_LOT],
  customer: [CUSTOMER],
  revision: [REVISION],
  shipment: [SHIPMENT],
  serviceCase: [SERVICE_CASE],
}

/**
 * One statement of the given SELECTs, each in parentheses so its ORDER BY and LIMIT hold. A
 * UNION takes its column names from its first SELECT, whichever that is; the alias list names
 * them the same for any choice.
 */
export function searchStatement(selects: readonly string[]): string {
  const union = selects.map((s) => `(${s.trim()})`).join('\nUNION ALL\n')
  return `SELECT * FROM (${union}) AS hit (kind, id, title, ref, rank, info)`
}
