import { z } from 'zod'
import { IdParam, scanText } from '../../shared/schemas/common'
import { CertificateRequestInput, ShipmentCreateInput } from '../../shared/schemas/shipping'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import {
  checkShippable,
  createShipment,
  getShipment,
  listShipments,
  listUnitDocuments,
  requestShipmentCertificate,
  requestUnitCertificate,
} from '../services/shipping'
import { createHandler, queryHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const shipmentRoutes = apiRoutes('/shipments')
export const unitDocumentRoutes = apiRoutes('/units')

const Serial = scanText('serial', 'scan a serial')
const Query = z.object({ customerId: IdParam.optional() })

shipmentRoutes.get('/', PERMISSIONS.readShipments, queryHandler(Query, listShipments))
shipmentRoutes.post(
  '/',
  PERMISSIONS.createShipments,
  createHandler(ShipmentCreateInput, createShipment),
)
// The packing screen checks each scan at once, before the shipment is confirmed.
shipmentRoutes.get('/units/:serial', PERMISSIONS.createShipments, async (req, res) => {
  res.json(await checkShippable(parse(Serial, req.params.serial)))
})
shipmentRoutes.get('/:id', PERMISSIONS.readShipments, readHandler(getShipment))
shipmentRoutes.post('/:id/certificate', PERMISSIONS.issueCustomerDocuments, async (req, res) => {
  res
    .status(201)
    .json(
      await requestShipmentCertificate(
        parse(IdParam, req.params.id),
        parse(CertificateRequestInput, req.body ?? {}),
        actorOf(req),
      ),
    )
})

unitDocumentRoutes.post(
  '/:serial/certificate',
  PERMISSIONS.issueCustomerDocuments,
  async (req, res) => {
    res
      .status(201)
      .json(
        await requestUnitCertificate(
          parse(Serial, req.params.serial),
          parse(CertificateRequestInput, req.body ?? {}),
          actorOf(req),
        ),
      )
  },
)
unitDocumentRoutes.get('/:serial/documents', PERMISSIONS.readShipments, async (req, res) => {
  res.json(await listUnitDocuments(parse(Serial, req.params.serial)))
})
