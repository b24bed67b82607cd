import { IdParam } from '../../shared/schemas/common'
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
import { apiRoutes } from './registry'

// The records inside a revision, addressed by their own ids. Each service locks the parent
// revision and refuses with 409 once it is released.
const edit = PERMISSIONS.editRecipes
const id = (p: { id?: string }) => parse(IdParam, p.id)

export const stepRoutes = apiRoutes('/steps')
stepRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateStep(id(req.params), parse(StepUpdateInput, req.body), actorOf(req)))
})
stepRoutes.delete('/:id', edit, async (req, res) => {
  await deleteStep(id(req.params), actorOf(req))
  res.status(204).end()
})
stepRoutes.post('/:id/checks', edit, async (req, res) => {
  res.status(201).json(await createCheck(id(req.params), parse(CheckInput, req.body), actorOf(req)))
})

export const checkRoutes = apiRoutes('/checks')
checkRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateCheck(id(req.params), parse(CheckUpdateInput, req.body), actorOf(req)))
})
checkRoutes.delete('/:id', edit, async (req, res) => {
  await deleteCheck(id(req.params), actorOf(req))
  res.status(204).end()
})

export const windingRoutes = apiRoutes('/windings')
windingRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateWinding(id(req.params), parse(WindingUpdateInput, req.body), actorOf(req)))
})
windingRoutes.delete('/:id', edit, async (req, res) => {
  await deleteWinding(id(req.params), actorOf(req))
  res.status(204).end()
})

export const bomLineRoutes = apiRoutes('/bom-lines')
bomLineRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateBomLine(id(req.params), parse(BomLineUpdateInput, req.body), actorOf(req)))
})
bomLineRoutes.delete('/:id', edit, async (req, res) => {
  await deleteBomLine(id(req.params), actorOf(req))
  res.status(204).end()
})
