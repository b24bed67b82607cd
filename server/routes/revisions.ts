import { IdParam } from '../../shared/schemas/common'
import {
  BomLineInput,
  ReleaseInput,
  RevisionUpdateInput,
  StepInput,
  StepOrderInput,
  WindingInput,
} from '../../shared/schemas/recipes'
import { can, PERMISSIONS } from '../../shared/permissions'
import { AppError } from '../errors'
import { actorOf, signedInUser } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createBomLine, listBom } from '../services/recipes'
import { assertRevisionReadable } from '../services/recipes'
import {
  copyRevision,
  deleteRevision,
  getRevision,
  obsoleteRevision,
  releaseCheck,
  releaseRevision,
  updateRevision,
} from '../services/recipes'
import { createStep, reorderSteps } from '../services/recipes'
import { createWinding } from '../services/recipes'
import { apiRoutes } from './registry'

export const revisionRoutes = apiRoutes('/revisions')
const edit = PERMISSIONS.editRecipes
const id = (p: { id?: string }) => parse(IdParam, p.id)

revisionRoutes.get('/:id', 'signed_in', async (req, res) => {
  const rev = await getRevision(id(req.params))
  // Operators, stores and service see what is built: released (or retired) revisions only; a
  // draft is answered as absent, so its existence does not show either.
  if (rev.status === 'draft' && !can(signedInUser(req).role, 'readDraftRecipes'))
    throw AppError.notFound(`revision ${rev.id}`)
  res.json(rev)
})

revisionRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateRevision(id(req.params), parse(RevisionUpdateInput, req.body), actorOf(req)))
})

revisionRoutes.delete('/:id', edit, async (req, res) => {
  await deleteRevision(id(req.params), actorOf(req))
  res.status(204).end()
})

revisionRoutes.get('/:id/release-check', PERMISSIONS.readReleaseCheck, async (req, res) => {
  res.json(await releaseCheck(id(req.params)))
})

revisionRoutes.post('/:id/release', edit, async (req, res) => {
  res.json(await releaseRevision(id(req.params), actorOf(req), parse(ReleaseInput, req.body ?? {})))
})

revisionRoutes.post('/:id/obsolete', edit, async (req, res) => {
  res.json(await obsoleteRevision(id(req.params), actorOf(req)))
})

revisionRoutes.post('/:id/copy', edit, async (req, res) => {
  res.status(201).json(await copyRevision(id(req.params), actorOf(req)))
})

revisionRoutes.post('/:id/windings', edit, async (req, res) => {
  res
    .status(201)
    .json(await createWinding(id(req.params), parse(WindingInput, req.body), actorOf(req)))
})

revisionRoutes.post('/:id/steps', edit, async (req, res) => {
  res.status(201).json(await createStep(id(req.params), parse(StepInput, req.body), actorOf(req)))
})

revisionRoutes.put('/:id/steps/order', edit, async (req, res) => {
  res.json(
    await reorderSteps(id(req.params), parse(StepOrderInput, req.body).stepIds, actorOf(req)),
  )
})

revisionRoutes.get('/:id/bom', 'signed_in', async (req, res) => {
  const revisionId = id(req.params)
  await assertRevisionReadable(revisionId, signedInUser(req).role)
  res.json(await listBom(revisionId))
})

revisionRoutes.post('/:id/bom', edit, async (req, res) => {
  res
    .status(201)
    .json(await createBomLine(id(req.params), parse(BomLineInput, req.body), actorOf(req)))
})
