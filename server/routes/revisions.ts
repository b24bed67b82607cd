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
import { changeHandler, deleteHandler, idOf, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const revisionRoutes = apiRoutes('/revisions')
const edit = PERMISSIONS.editRecipes

revisionRoutes.get('/:id', 'signed_in', async (req, res) => {
  const rev = await getRevision(idOf(req.params))
  // Operators, stores and service see what is built: released (or retired) revisions only; a
  // draft is answered as absent, so its existence does not show either.
  if (rev.status === 'draft' && !can(signedInUser(req).role, 'readDraftRecipes'))
    throw AppError.notFound(`revision ${rev.id}`)
  res.json(rev)
})

revisionRoutes.patch('/:id', edit, changeHandler(RevisionUpdateInput, updateRevision))

revisionRoutes.delete('/:id', edit, deleteHandler(deleteRevision))

revisionRoutes.get('/:id/release-check', PERMISSIONS.readReleaseCheck, readHandler(releaseCheck))

revisionRoutes.post('/:id/release', edit, async (req, res) => {
  res.json(
    await releaseRevision(idOf(req.params), actorOf(req), parse(ReleaseInput, req.body ?? {})),
  )
})

revisionRoutes.post('/:id/obsolete', edit, async (req, res) => {
  res.json(await obsoleteRevision(idOf(req.params), actorOf(req)))
})

revisionRoutes.post('/:id/copy', edit, async (req, res) => {
  res.status(201).json(await copyRevision(idOf(req.params), actorOf(req)))
})

revisionRoutes.post('/:id/windings', edit, async (req, res) => {
  res
    .status(201)
    .json(await createWinding(idOf(req.params), parse(WindingInput, req.body), actorOf(req)))
})

revisionRoutes.post('/:id/steps', edit, async (req, res) => {
  res.status(201).json(await createStep(idOf(req.params), parse(StepInput, req.body), actorOf(req)))
})

revisionRoutes.put('/:id/steps/order', edit, async (req, res) => {
  res.json(
    await reorderSteps(idOf(req.params), parse(StepOrderInput, req.body).stepIds, actorOf(req)),
  )
})

revisionRoutes.get('/:id/bom', 'signed_in', async (req, res) => {
  const revisionId = idOf(req.params)
  await assertRevisionReadable(revisionId, signedInUser(req).role)
  res.json(await listBom(revisionId))
})

revisionRoutes.post('/:id/bom', edit, async (req, res) => {
  res
    .status(201)
    .json(await createBomLine(idOf(req.params), parse(BomLineInput, req.body), actorOf(req)))
})
