import { Customer, Shipment, ShipmentUnit, Unit } from '../../../server/models'
import { uniqueSuffix } from './client'

/** Ships units to a new customer through the models (the shipment service is built elsewhere). */
export async function shipTo(serials: string[], customerName: string, contactEmail: string) {
  const customer = await Customer.create({ name: customerName, contactEmail })
  const shipment = await Shipment.create({
    number: `S-${uniqueSuffix()}`,
    customerId: customer.id,
    orderRef: `PO-${uniqueSuffix()}`,
    carrier: 'Harrow Freight',
    tracking: `HF${uniqueSuffix()}`,
    shippedOn: '2026-12-01',
    createdBy: null,
  })
  for (const serial of serials) {
    const unit = (await Unit.findOne({ where: { serial } }))!
    await ShipmentUnit.create({ unitId: unit.id, shipmentId: shipment.id })
    await unit.update({ state: 'shipped' })
  }
  return { customer, shipment }
}
