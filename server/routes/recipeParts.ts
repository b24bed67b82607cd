import {
  BomLineUpdateInput,
  CheckInput,
  CheckUpdateInput,
  StepUpdateInput,
  WindingUpdateInput,
} from '../../shared/schemas/recipes'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { deleteBomLine, updateBomLine } from '../services/recipes'
import { createCheck, deleteCheck, updateCheck } from '../services/recipes'
import { deleteStep, updateStep } from '../services/recipes'
import { deleteWinding, updateWinding } from '../services/recipes'
import { changeHandler, deleteHandler, idOf } from './handlers'
import { apiRoutes } from './registry'

// The records inside a revision, addressed by their own ids. Each service locks the parent
// revision and refuses with 409 once it is released.
const edit = PERMISSIONS.editRecipes

export const stepRoutes = apiRoutes('/steps')
stepRoutes.patch('/:id', edit, changeHandler(StepUpdateInput, updateStep))
stepRoutes.delete('/:id', edit, deleteHandler(deleteStep))
stepRoutes.post('/:id/checks', edit, async (req, res) => {
  res
    .status(201)
    .json(await createCheck(idOf(req.params), parse(CheckInput, req.body), actorOf(req)))
})

export const checkRoutes = apiRoutes('/checks')
checkRoutes.patch('/:id', edit, changeHandler(CheckUpdateInput, updateCheck))
checkRoutes.delete('/:id', edit, deleteHandler(deleteCheck))

export const windingRoutes = apiRoutes('/windings')
windingRoutes.patch('/:id', edit, changeHandler(WindingUpdateInput, updateWinding))
windingRoutes.delete('/:id', edit, deleteHandler(deleteWinding))

export const bomLineRoutes = apiRoutes('/bom-lines')
bomLineRoutes.patch('/:id', edit, changeHandler(BomLineUpdateInput, updateBomLine))
bomLineRoutes.delete('/:id', edit, deleteHandler(deleteBomLine))
