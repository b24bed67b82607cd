import { IdParam } from '../../shared/schemas/common'
import { PartQuery } from '../../shared/schemas/componentLots'
import {
  DefectCodeInput,
  DefectCodeUpdateInput,
  PartInput,
  PartUpdateInput,
} from '../../shared/schemas/recipes'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createDefectCode, listDefectCodes, updateDefectCode } from '../services/recipes'
import { createPart, listParts, updatePart } from '../services/recipes'
import { apiRoutes } from './registry'

export const partRoutes = apiRoutes('/parts')

partRoutes.get('/', PERMISSIONS.readParts, async (req, res) => {
  res.json(await listParts(parse(PartQuery, req.query)))
})
partRoutes.post('/', PERMISSIONS.editParts, async (req, res) => {
  res.status(201).json(await createPart(parse(PartInput, req.body), actorOf(req)))
})
partRoutes.patch('/:id', PERMISSIONS.editParts, async (req, res) => {
  res.json(
    await updatePart(parse(IdParam, req.params.id), parse(PartUpdateInput, req.body), actorOf(req)),
  )
})

export const defectCodeRoutes = apiRoutes('/defect-codes')

defectCodeRoutes.get('/', 'signed_in', async (_req, res) => {
  res.json(await listDefectCodes())
})
defectCodeRoutes.post('/', PERMISSIONS.editDefectCodes, async (req, res) => {
  res.status(201).json(await createDefectCode(parse(DefectCodeInput, req.body), actorOf(req)))
})
defectCodeRoutes.patch('/:id', PERMISSIONS.editDefectCodes, async (req, res) => {
  res.json(
    await updateDefectCode(
      parse(IdParam, req.params.id),
      parse(DefectCodeUpdateInput, req.body),
      actorOf(req),
    ),
  )
})
