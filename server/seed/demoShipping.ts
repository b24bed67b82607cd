import { Customer, Lot, ServiceCase, Shipment, User } from '../models'
import type { Role } from '../../shared/roles'
import type { Actor } from '../services/admin'
import { createCustomer } from '../services/shipping'
import { emailDocument } from '../services/mail'
import { renderDocument } from '../services/documents'
import { requestDocument } from '../services/documents'
import { listLotUnits } from '../services/lots'
import { openServiceCase } from '../services/service-cases'
import { createShipment, shipmentFilename } from '../services/shipping'
import { withTransaction } from '../db/sql'

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
]

async function person(email: string): Promise<Actor & { role: Role }> {
  const u = (await User.findOne({ where: { email } }))!
  return { id: u.id, email: u.email, role: u.role, ip: null, requestId: 'demo-seed' }
}

/** The demo customers, through the same service as the Customers screen. */
export async function loadDemoCustomers(): Promise<void> {
  if ((await Customer.count()) > 0) return
  const lead = await person('lead@ferncastle.example')
  for (const c of DEMO_CUSTOMERS) await createCustomer(c, lead)
}

/** Makes a document's PDF now, with the worker's own code, so the seed can e-mail it at once. */
async function requestAndRender(
  spec: Parameters<typeof requestDocument>[0],
  actor: Actor,
): Promise<string> {
  const doc = await withTransaction((t) => requestDocument(spec, actor, t))
  await renderDocument(doc.id, async () => {})
  return doc.id
}

/**
 * Ships the finished lot to its customer with its packing slip, makes and e-mails the
 * certificate (so the Outbox has it), and opens one return on one of its serials.
 */
export async function loadDemoShipping(): Promise<void> {
  if ((await Shipment.count()) > 0) return
  const lot = await Lot.findOne({ where: { number: 'L-0001' } })
  if (!lot?.customerId) return
  const service = await person('service@ferncastle.example')
  const lead = await person('lead@ferncastle.example')
  const units = (await listLotUnits(lot.id)).filter((u) => u.state === 'passed')
  // The demo lot's step runs are recorded as the seed runs, so it ships and comes back that day.
  const today = new Date().toISOString().slice(0, 10)
  const shipment = await createShipment(
    {
      customerId: lot.customerId,
      orderRef: lot.orderRef,
      carrier: 'Tarn Valley Freight',
      tracking: 'TVF 3318 0427 91',
      shippedOn: today,
      serials: units.map((u) => u.serial),
    },
    lead,
  )
  const slip = shipment.documents.find((d) => d.kind === 'packing_slip')
  if (slip) await renderDocument(slip.id, async () => {})
  const certificateId = await requestAndRender(
    {
      kind: 'certificate',
      shipmentId: shipment.id,
      filename: shipmentFilename(shipment.number, 'certificate'),
    },
    service,
  )
  await emailDocument(
    certificateId,
    { to: [], note: `Certificate for your order ${lot.orderRef}, shipped today.` },
    service,
  )
  if ((await ServiceCase.count()) === 0)
    await openServiceCase(
      {
        serial: units[4]!.serial,
        complaint:
          'Output drops to about 0 V after 20 minutes at full load; recovers after cooling.',
        receivedOn: today,
      },
      service,
    )
}
