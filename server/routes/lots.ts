import { z } from 'zod'
import {
  DocumentRequestInput,
  LotCreateInput,
  LotUpdateInput,
  ReasonInput,
} from '../../shared/schemas/lots'
import { LOT_STATUSES } from '../../shared/lots'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { listLotDocuments } from '../services/documents'
import { lotGrid, listLotUnits } from '../services/lots'
import {
  closeLot,
  createLot,
  getLot,
  holdLot,
  listLots,
  releaseLot,
  requestLotDocument,
  unholdLot,
  updateLot,
} from '../services/lots'
import { changeHandler, createHandler, idOf, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const lotRoutes = apiRoutes('/lots')
const read = PERMISSIONS.readLots
const edit = PERMISSIONS.editLots

lotRoutes.get('/', read, async (req, res) => {
  res.json(await listLots(parse(z.object({ status: z.enum(LOT_STATUSES).optional() }), req.query)))
})
lotRoutes.post('/', edit, createHandler(LotCreateInput, createLot))
lotRoutes.get('/:id', read, readHandler(getLot))
lotRoutes.patch('/:id', edit, changeHandler(LotUpdateInput, updateLot))
lotRoutes.post('/:id/release', edit, async (req, res) => {
  res.json(await releaseLot(idOf(req.params), actorOf(req)))
})
lotRoutes.post('/:id/hold', edit, async (req, res) => {
  res.json(await holdLot(idOf(req.params), parse(ReasonInput, req.body).reason, actorOf(req)))
})
lotRoutes.post('/:id/unhold', edit, async (req, res) => {
  res.json(await unholdLot(idOf(req.params), parse(ReasonInput, req.body).reason, actorOf(req)))
})
lotRoutes.post('/:id/close', edit, async (req, res) => {
  res.json(await closeLot(idOf(req.params), actorOf(req)))
})
lotRoutes.get('/:id/units', read, readHandler(listLotUnits))
lotRoutes.get('/:id/grid', read, readHandler(lotGrid))
lotRoutes.get('/:id/documents', read, readHandler(listLotDocuments))
lotRoutes.post('/:id/documents', edit, async (req, res) => {
  const input = parse(DocumentRequestInput, req.body)
  res.status(201).json(await requestLotDocument(idOf(req.params), input, actorOf(req)))
})
