import { scanText } from '../../shared/schemas/common'
import {
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseQuery,
  ServiceCaseUpdateInput,
} from '../../shared/schemas/shipping'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import {
  checkReturnable,
  closeServiceCase,
  getServiceCase,
  listServiceCases,
  openServiceCase,
  updateServiceCase,
} from '../services/service-cases'
import { changeHandler, createHandler, queryHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const serviceCaseRoutes = apiRoutes('/service-cases')
const Serial = scanText('serial', 'scan a serial')

serviceCaseRoutes.get(
  '/',
  PERMISSIONS.readServiceCases,
  queryHandler(ServiceCaseQuery, listServiceCases),
)
serviceCaseRoutes.post(
  '/',
  PERMISSIONS.editServiceCases,
  createHandler(ServiceCaseCreateInput, openServiceCase),
)
// The return dialog shows what the scanned serial is before the return is logged.
serviceCaseRoutes.get('/units/:serial', PERMISSIONS.editServiceCases, async (req, res) => {
  res.json(await checkReturnable(parse(Serial, req.params.serial)))
})
serviceCaseRoutes.get('/:id', PERMISSIONS.readServiceCases, readHandler(getServiceCase))
serviceCaseRoutes.patch(
  '/:id',
  PERMISSIONS.editServiceCases,
  changeHandler(ServiceCaseUpdateInput, updateServiceCase),
)
serviceCaseRoutes.post(
  '/:id/close',
  PERMISSIONS.editServiceCases,
  changeHandler(ServiceCaseCloseInput, closeServiceCase),
)
