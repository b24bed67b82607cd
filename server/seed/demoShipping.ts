import { Customer, Unit } from '../models'
import type { Actor } from '../services/admin'
import { renderDocument, requestDocument } from '../services/documents'
import { emailDocument } from '../services/mail'
import { closeServiceCase, openServiceCase } from '../services/service-cases'
import { createCustomer, createShipment, shipmentFilename } from '../services/shipping'
import { listLotUnits } from '../services/lots'
import { withTransaction } from '../db/sql'
import type { Person } from './demoTimeline'

/** The demo shop's buyers (invented), DESIGN.md §10. */
export const DEMO_CUSTOMERS = [
  {
    name: 'Halden Rail Systems',
    contactEmail: 'purchasing@halden-rail.example',
    address: 'Goods-in, Unit 4 Wharf Road\nHalden Industrial Park\nHD7 2QX',
  },
  {
    name: 'Corrin Instruments',
    contactEmail: 'orders@corrin-instruments.example',
    address: '18 Millrace Lane\nCorrin Bridge\nCB3 9LT',
  },
  {
    name: 'Norvale Labs',
    contactEmail: 'lab.stores@norvale.example',
    address: 'Norvale Science Centre, Building C\nNV1 4RA',
  },
  {
    name: 'Selworth Marine',
    contactEmail: 'buying@selworth-marine.example',
    address: 'Boatyard Office, Quay Street\nSelworth\nSW4 8PE',
  },
  {
    name: 'Brackwater Energy',
    contactEmail: 'supply@brackwater.example',
    address: 'Unit 12, Fenside Business Park\nBrackwater\nBW2 6NH',
  },
]

/** The demo customers, through the same service as the Customers screen; skipped when any exist. */
export async function loadDemoCustomers(lead: Actor): Promise<void> {
  if ((await Customer.count()) > 0) return
  for (const c of DEMO_CUSTOMERS) await createCustomer(c, lead)
}

/** The id of the demo customer of this name. */
export async function demoCustomerId(name: string): Promise<string> {
  const c = await Customer.findOne({ where: { name } })
  if (!c) throw new Error(`demo seed: no customer ${name}`)
  return c.id
}

const MINUTE_MS = 60_000

/**
 * Makes a document's PDF now, with the worker's own code, so the seed can e-mail it at once;
 * asked for at `at` and made a minute later in the story's time.
 */
async function requestAndRender(
  spec: Parameters<typeof requestDocument>[0],
  actor: Actor,
  at: Date,
): Promise<string> {
  const doc = await withTransaction((t) => requestDocument(spec, actor, t, at))
  await renderDocument(doc.id, async () => {}, new Date(at.getTime() + MINUTE_MS))
  return doc.id
}

/**
 * Ships every passed unit of a lot to its customer with its packing slip, makes the certificate
 * of conformance and e-mails it to the customer's contact (so the Outbox has it), each stamped
 * with the story's time: packed at `at`, the certificate asked for ten minutes later and sent
 * a quarter of an hour after that.
 */
export async function shipLot(
  lotId: string,
  order: { customerId: string; orderRef: string; carrier: string; tracking: string },
  people: { lead: Person; service: Person },
  at: Date,
): Promise<{ number: string; serials: string[] }> {
  const serials = (await listLotUnits(lotId))
    .filter((u) => u.state === 'passed')
    .map((u) => u.serial)
  const shipment = await createShipment(
    { ...order, shippedOn: at.toISOString().slice(0, 10), serials },
    people.lead,
    undefined,
    at,
  )
  const slip = shipment.documents.find((d) => d.kind === 'packing_slip')
  if (slip) await renderDocument(slip.id, async () => {}, new Date(at.getTime() + MINUTE_MS))
  const certificateId = await requestAndRender(
    {
      kind: 'certificate',
      shipmentId: shipment.id,
      filename: shipmentFilename(shipment.number, 'certificate'),
    },
    people.service,
    new Date(at.getTime() + 10 * MINUTE_MS),
  )
  await emailDocument(
    certificateId,
    { to: [], note: `Certificate of conformance for your order ${order.orderRef}.` },
    people.service,
    new Date(at.getTime() + 25 * MINUTE_MS),
  )
  return { number: shipment.number, serials }
}

/** Opens a return for a shipped unit, and when `closed` is given closes it with that finding. */
export async function demoReturn(
  serial: string,
  complaint: string,
  service: Person,
  opened: Date,
  closed?: { at: Date; resolution: 'no_fault_found' | 'credit' },
): Promise<void> {
  const sc = await openServiceCase(
    { serial, complaint, receivedOn: opened.toISOString().slice(0, 10) },
    service,
    opened,
  )
  if (!closed) return
  await closeServiceCase(
    sc.id,
    { resolution: closed.resolution, reworkToStepId: null, replacementSerial: null },
    service,
    closed.at,
  )
}

/** True when the unit of this serial shipped (used to check the story before a return). */
export async function isShipped(serial: string): Promise<boolean> {
  return (await Unit.findOne({ where: { serial } }))?.state === 'shipped'
}
