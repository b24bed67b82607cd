import type { CertificateData, CertificateGroup, CertificateRun } from '../../documents/certificate'
import type { PackingSlipData } from '../../documents/packingSlip'
import { env } from '../../env'
import { User } from '../../models'
import { select } from '../../db/sql'
import type { Document } from '../../models'
import { toRevisionDto } from '../recipes'
import { loadRevision } from '../recipes'

// What a shipment's or a unit's customer papers print (the certificate of conformance and the
// packing slip), read from the database for the renderers in server/documents/.

interface PaperUnit {
  id: string
  serial: string
  lot_number: string
  revision_id: string
  finished_at: Date | null
}

interface PaperShipment {
  number: string
  order_ref: string
  carrier: string
  tracking: string
  shipped_on: string
  customer_name: string
  customer_address: string
}

const day = (d: Date) => new Date(d).toISOString().slice(0, 10)

/** The shipment a document belongs to (its own, or its unit's latest), with the customer. */
async function paperShipment(doc: Document): Promise<PaperShipment | null> {
  const [row] = await select<PaperShipment>(
    `SELECT s.number, s.order_ref, s.carrier, s.tracking, s.shipped_on::text AS shipped_on,
            c.name AS customer_name, c.address AS customer_address
       FROM shipments s JOIN customers c ON c.id = s.customer_id
      WHERE s.id = COALESCE(:shipmentId, (SELECT su.shipment_id FROM shipment_units su
              WHERE su.unit_id = :unitId ORDER BY su.created_at DESC LIMIT 1))`,
    {
      replacements: { shipmentId: doc.shipmentId, unitId: doc.unitId },
    },
  )
  return row ?? null
}

async function paperUnits(doc: Document): Promise<PaperUnit[]> {
  return select<PaperUnit>(
    `SELECT u.id, u.serial, l.number AS lot_number, l.revision_id, u.finished_at
       FROM units u JOIN lots l ON l.id = u.lot_id
      WHERE ${doc.shipmentId ? 'u.id IN (SELECT unit_id FROM shipment_units WHERE shipment_id = :shipmentId)' : 'u.id = :unitId'}
      ORDER BY u.serial`,
    {
      replacements: { shipmentId: doc.shipmentId, unitId: doc.unitId },
    },
  )
}

interface RunRow {
  id: string
  unit_id: string
  step_id: string
  attempt: number
  finished_at: Date
}
interface ValueRow {
  step_run_id: string
  check_id: string
  value_number: number | null
  value_text: string | null
  value_boolean: boolean | null
  is_pass: boolean
  is_derived: boolean
}

/** Each unit's last passing run of each step, with its measurements: the values that count. */
async function passingRuns(unitIds: string[]): Promise<Map<string, CertificateRun[]>> {
  const runs = await select<RunRow>(
    `SELECT DISTINCT ON (unit_id, step_id) id, unit_id, step_id, attempt, finished_at
       FROM step_runs WHERE unit_id IN (:unitIds) AND result = 'pass'
      ORDER BY unit_id, step_id, finished_at DESC, id`,
    { replacements: { unitIds } },
  )
  const values = runs.length
    ? await select<ValueRow>(
        `SELECT step_run_id, check_id, value_number, value_text, value_boolean, is_pass, is_derived
           FROM measurements WHERE step_run_id IN (:ids)`,
        { replacements: { ids: runs.map((r) => r.id) } },
      )
    : []
  const byRun = new Map<string, ValueRow[]>()
  for (const v of values) byRun.set(v.step_run_id, [...(byRun.get(v.step_run_id) ?? []), v])
  const out = new Map<string, CertificateRun[]>()
  for (const r of runs) {
    const list = out.get(r.unit_id) ?? []
    list.push({
      stepId: r.step_id,
      attempt: r.attempt,
      finishedOn: day(r.finished_at),
      values: Object.fromEntries(
        (byRun.get(r.id) ?? []).map((v) => [
          v.check_id,
          {
            number: v.value_number === null ? null : Number(v.value_number),
            text: v.value_text,
            boolean: v.value_boolean,
            isPass: v.is_pass,
            isDerived: v.is_derived,
          },
        ]),
      ),
    })
    out.set(r.unit_id, list)
  }
  return out
}

async function issuerName(doc: Document): Promise<string> {
  const user = doc.createdBy ? await User.findByPk(doc.createdBy) : null
  return user?.name ?? 'Waymark'
}

/** What a certificate document prints, read from the database. */
export async function certificateData(doc: Document): Promise<CertificateData> {
  const units = await paperUnits(doc)
  const shipment = await paperShipment(doc)
  const runs = await passingRuns(units.map((u) => u.id))
  const groups: CertificateGroup[] = []
  for (const revisionId of [...new Set(units.map((u) => u.revision_id))]) {
    const rev = toRevisionDto(await loadRevision(revisionId))
    groups.push({
      product: { code: rev.productCode, name: rev.productName },
      revision: rev.letter,
      steps: rev.steps.map((s) => ({
        id: s.id,
        position: s.position,
        name: s.name,
        stationKind: s.stationKind,
        // Only what the engineer marked for customers: turn counts stay internal by default.
        checks: s.checks.filter((c) => c.isForCustomers),
      })),
      units: units
        .filter((u) => u.revision_id === revisionId)
        .map((u) => ({
          serial: u.serial,
          lotNumber: u.lot_number,
          passedOn: u.finished_at ? day(u.finished_at) : null,
          runs: runs.get(u.id) ?? [],
        })),
    })
  }
  const isUnit = !doc.shipmentId
  return {
    shopName: env.WAYMARK_SHOP_NAME,
    reference: isUnit ? (units[0]?.serial ?? '') : (shipment?.number ?? ''),
    scope: isUnit ? 'unit' : 'shipment',
    issuedAt: doc.createdAt,
    issuedBy: await issuerName(doc),
    customer: shipment
      ? { name: shipment.customer_name, address: shipment.customer_address }
      : null,
    shipment: shipment
      ? { number: shipment.number, orderRef: shipment.order_ref, shippedOn: shipment.shipped_on }
      : null,
    groups,
  }
}

/** What a shipment's packing slip prints, read from the database. */
export async function packingSlipData(doc: Document): Promise<PackingSlipData> {
  const shipment = await paperShipment(doc)
  if (!shipment) throw new Error(`document ${doc.id} has no shipment`)
  const units = await select<{
    serial: string
    product_code: string
    product_name: string
    letter: string
    lot_number: string
  }>(
    `SELECT u.serial, p.code AS product_code, p.name AS product_name, r.letter,
            l.number AS lot_number
       FROM shipment_units su JOIN units u ON u.id = su.unit_id JOIN lots l ON l.id = u.lot_id
       JOIN revisions r ON r.id = l.revision_id JOIN products p ON p.id = r.product_id
      WHERE su.shipment_id = :id ORDER BY p.code, u.serial`,
    { replacements: { id: doc.shipmentId } },
  )
  return {
    shopName: env.WAYMARK_SHOP_NAME,
    shipment: {
      number: shipment.number,
      orderRef: shipment.order_ref,
      carrier: shipment.carrier,
      tracking: shipment.tracking,
      shippedOn: shipment.shipped_on,
    },
    customer: { name: shipment.customer_name, address: shipment.customer_address },
    units: units.map((u) => ({
      serial: u.serial,
      productCode: u.product_code,
      productName: u.product_name,
      revision: u.letter,
      lotNumber: u.lot_number,
    })),
    packedBy: await issuerName(doc),
    issuedAt: doc.createdAt,
  }
}
