import multer from 'multer'
import {
  ComponentLotCreateInput,
  ComponentLotInspectionInput,
  ComponentLotQuery,
  ComponentLotStatusInput,
  ComponentLotUpdateInput,
} from '../../shared/schemas/componentLots'
import { SupplierInput, SupplierQuery } from '../../shared/schemas/suppliers'
import { PERMISSIONS } from '../../shared/permissions'
import { componentLotLabelPdf } from '../documents/componentLotLabel'
import { env } from '../env'
import { AppError } from '../errors'
import { actorOf } from '../middleware/access'
import { sendStoredFile } from '../middleware/storedFile'
import { multipartUpload } from '../middleware/requestChecks'
import { parse } from '../middleware/validate'
import {
  attachCertificate,
  certificateOf,
  addSupplier,
  getComponentLot,
  inspectComponentLot,
  listComponentLots,
  listSuppliers,
  receiveComponentLot,
  setComponentLotStatus,
  updateComponentLot,
} from '../services/receiving'
import { CERTIFICATE_MAX_BYTES } from '../services/receiving'
import { getFile } from '../storage'
import { changeHandler, createHandler, idOf, queryHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const componentLotRoutes = apiRoutes('/component-lots')

// Held in memory: the file goes to the object store, never to this process's disk.
const upload = multipartUpload(
  multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: CERTIFICATE_MAX_BYTES, files: 1 },
  }).single('file'),
)

componentLotRoutes.get(
  '/',
  PERMISSIONS.readComponentLots,
  queryHandler(ComponentLotQuery, listComponentLots),
)

componentLotRoutes.post(
  '/',
  PERMISSIONS.editComponentLots,
  createHandler(ComponentLotCreateInput, receiveComponentLot),
)

componentLotRoutes.get('/:id', PERMISSIONS.readComponentLots, readHandler(getComponentLot))

componentLotRoutes.patch(
  '/:id',
  PERMISSIONS.editComponentLots,
  changeHandler(ComponentLotUpdateInput, updateComponentLot),
)

componentLotRoutes.post(
  '/:id/status',
  PERMISSIONS.setComponentLotStatus,
  changeHandler(ComponentLotStatusInput, setComponentLotStatus),
)

componentLotRoutes.post(
  '/:id/inspection',
  PERMISSIONS.editComponentLots,
  changeHandler(ComponentLotInspectionInput, inspectComponentLot),
)

componentLotRoutes.put(
  '/:id/certificate',
  PERMISSIONS.editComponentLots,
  upload,
  async (req, res) => {
    if (!req.file)
      throw AppError.badRequest('file: attach the certificate as the form field "file"', {
        file: 'attach a file',
      })
    res.json(await attachCertificate(idOf(req.params), req.file, actorOf(req)))
  },
)

componentLotRoutes.get('/:id/certificate', PERMISSIONS.readComponentLots, async (req, res) => {
  const cert = await certificateOf(idOf(req.params))
  const file = await getFile(cert.storageKey)
  await sendStoredFile(res, {
    body: file.body,
    contentType: cert.contentType,
    filename: cert.filename,
  })
})

componentLotRoutes.get('/:id/label.pdf', PERMISSIONS.printLotLabels, async (req, res) => {
  const lot = await getComponentLot(idOf(req.params))
  res.type('application/pdf')
  res.setHeader('Content-Disposition', `inline; filename="label-${lot.internalCode}.pdf"`)
  res.send(await componentLotLabelPdf(lot, env.publicBaseUrl))
})

/** Suppliers are records: receiving picks one from these suggestions or adds one. */
export const supplierRoutes = apiRoutes('/suppliers')

supplierRoutes.get('/', PERMISSIONS.readComponentLots, queryHandler(SupplierQuery, listSuppliers))

supplierRoutes.post('/', PERMISSIONS.editComponentLots, async (req, res) => {
  const { supplier, isNew } = await addSupplier(parse(SupplierInput, req.body), actorOf(req))
  res.status(isNew ? 201 : 200).json(supplier)
})
