import multer from 'multer'
import { IdParam } from '../../shared/schemas/common'
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
import { apiRoutes } from './registry'

export const componentLotRoutes = apiRoutes('/component-lots')
const id = (p: { id?: string }) => parse(IdParam, p.id)

// Held in memory: the file goes to the object store, never to this process's disk.
const upload = multipartUpload(
  multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: CERTIFICATE_MAX_BYTES, files: 1 },
  }).single('file'),
)

componentLotRoutes.get('/', PERMISSIONS.readComponentLots, async (req, res) => {
  res.json(await listComponentLots(parse(ComponentLotQuery, req.query)))
})

componentLotRoutes.post('/', PERMISSIONS.editComponentLots, async (req, res) => {
  res
    .status(201)
    .json(await receiveComponentLot(parse(ComponentLotCreateInput, req.body), actorOf(req)))
})

componentLotRoutes.get('/:id', PERMISSIONS.readComponentLots, async (req, res) => {
  res.json(await getComponentLot(id(req.params)))
})

componentLotRoutes.patch('/:id', PERMISSIONS.editComponentLots, async (req, res) => {
  res.json(
    await updateComponentLot(
      id(req.params),
      parse(ComponentLotUpdateInput, req.body),
      actorOf(req),
    ),
  )
})

componentLotRoutes.post('/:id/status', PERMISSIONS.setComponentLotStatus, async (req, res) => {
  res.json(
    await setComponentLotStatus(
      id(req.params),
      parse(ComponentLotStatusInput, req.body),
      actorOf(req),
    ),
  )
})

componentLotRoutes.post('/:id/inspection', PERMISSIONS.editComponentLots, async (req, res) => {
  res.json(
    await inspectComponentLot(
      id(req.params),
      parse(ComponentLotInspectionInput, req.body),
      actorOf(req),
    ),
  )
})

componentLotRoutes.put(
  '/:id/certificate',
  PERMISSIONS.editComponentLots,
  upload,
  async (req, res) => {
    if (!req.file)
      throw AppError.badRequest('file: attach the certificate as the form field "file"', {
        file: 'attach a file',
      })
    res.json(await attachCertificate(id(req.params), req.file, actorOf(req)))
  },
)

componentLotRoutes.get('/:id/certificate', PERMISSIONS.readComponentLots, async (req, res) => {
  const cert = await certificateOf(id(req.params))
  const file = await getFile(cert.storageKey)
  await sendStoredFile(res, {
    body: file.body,
    contentType: cert.contentType,
    filename: cert.filename,
  })
})

componentLotRoutes.get('/:id/label.pdf', PERMISSIONS.printLotLabels, async (req, res) => {
  const lot = await getComponentLot(id(req.params))
  res.type('application/pdf')
  res.setHeader('Content-Disposition', `inline; filename="label-${lot.internalCode}.pdf"`)
  res.send(await componentLotLabelPdf(lot, env.publicBaseUrl))
})

/** Suppliers are records: receiving picks one from these suggestions or adds one. */
export const supplierRoutes = apiRoutes('/suppliers')

supplierRoutes.get('/', PERMISSIONS.readComponentLots, async (req, res) => {
  res.json(await listSuppliers(parse(SupplierQuery, req.query)))
})

supplierRoutes.post('/', PERMISSIONS.editComponentLots, async (req, res) => {
  const { supplier, isNew } = await addSupplier(parse(SupplierInput, req.body), actorOf(req))
  res.status(isNew ? 201 : 200).json(supplier)
})
