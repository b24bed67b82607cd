import { IdParam, scanText } from '../../shared/schemas/common'
import {
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseQuery,
  ServiceCaseUpdateInput,
} from '../../shared/schemas/shipping'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import {
  checkReturnable,
  closeServiceCase,
  getServiceCase,
  listServiceCases,
  openServiceCase,
  updateServiceCase,
} from '../services/service-cases'
import { apiRoutes } from './registry'

export const serviceCaseRoutes = apiRoutes('/service-cases')
const id = (p: { id?: string }) => parse(IdParam, p.id)
const Serial = scanText('serial', 'scan a serial')

serviceCaseRoutes.get('/', PERMISSIONS.readServiceCases, async (req, res) => {
  res.json(await listServiceCases(parse(ServiceCaseQuery, req.query)))
})
serviceCaseRoutes.post('/', PERMISSIONS.editServiceCases, async (req, res) => {
  res.status(201).json(await openServiceCase(parse(ServiceCaseCreateInput, req.body), actorOf(req)))
})
// The return dialog shows what the scanned serial is before the return is logged.
serviceCaseRoutes.get('/units/:serial', PERMISSIONS.editServiceCases, async (req, res) => {
  res.json(await checkReturnable(parse(Serial, req.params.serial)))
})
serviceCaseRoutes.get('/:id', PERMISSIONS.readServiceCases, async (req, res) => {
  res.json(await getServiceCase(id(req.params)))
})
serviceCaseRoutes.patch('/:id', PERMISSIONS.editServiceCases, async (req, res) => {
  res.json(
    await updateServiceCase(id(req.params), parse(ServiceCaseUpdateInput, req.body), actorOf(req)),
  )
})
serviceCaseRoutes.post('/:id/close', PERMISSIONS.editServiceCases, async (req, res) => {
  res.json(
    await closeServiceCase(id(req.params), parse(ServiceCaseCloseInput, req.body), actorOf(req)),
  )
})
