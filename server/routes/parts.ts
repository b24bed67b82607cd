import { PartQuery } from '../../shared/schemas/componentLots'
import {
  DefectCodeInput,
  DefectCodeUpdateInput,
  PartInput,
  PartUpdateInput,
} from '../../shared/schemas/recipes'
import { PERMISSIONS } from '../../shared/permissions'
import { createDefectCode, listDefectCodes, updateDefectCode } from '../services/recipes'
import { createPart, listParts, updatePart } from '../services/recipes'
import { changeHandler, createHandler, queryHandler } from './handlers'
import { apiRoutes } from './registry'

export const partRoutes = apiRoutes('/parts')

partRoutes.get('/', PERMISSIONS.readParts, queryHandler(PartQuery, listParts))
partRoutes.post('/', PERMISSIONS.editParts, createHandler(PartInput, createPart))
partRoutes.patch('/:id', PERMISSIONS.editParts, changeHandler(PartUpdateInput, updatePart))

export const defectCodeRoutes = apiRoutes('/defect-codes')

defectCodeRoutes.get('/', 'signed_in', async (_req, res) => {
  res.json(await listDefectCodes())
})
defectCodeRoutes.post(
  '/',
  PERMISSIONS.editDefectCodes,
  createHandler(DefectCodeInput, createDefectCode),
)
defectCodeRoutes.patch(
  '/:id',
  PERMISSIONS.editDefectCodes,
  changeHandler(DefectCodeUpdateInput, updateDefectCode),
)
