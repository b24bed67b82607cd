import { z } from 'zod'
import { IdParam } from '../../shared/schemas/common'
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
import { apiRoutes } from './registry'

export const lotRoutes = apiRoutes('/lots')
const read = PERMISSIONS.readLots
const edit = PERMISSIONS.editLots
const id = (p: { id?: string }) => parse(IdParam, p.id)

lotRoutes.get('/', read, async (req, res) => {
  res.json(await listLots(parse(z.object({ status: z.enum(LOT_STATUSES).optional() }), req.query)))
})
lotRoutes.post('/', edit, async (req, res) => {
  res.status(201).json(await createLot(parse(LotCreateInput, req.body), actorOf(req)))
})
lotRoutes.get('/:id', read, async (req, res) => {
  res.json(await getLot(id(req.params)))
})
lotRoutes.patch('/:id', edit, async (req, res) => {
  res.json(await updateLot(id(req.params), parse(LotUpdateInput, req.body), actorOf(req)))
})
lotRoutes.post('/:id/release', edit, async (req, res) => {
  res.json(await releaseLot(id(req.params), actorOf(req)))
})
lotRoutes.post('/:id/hold', edit, async (req, res) => {
  res.json(await holdLot(id(req.params), parse(ReasonInput, req.body).reason, actorOf(req)))
})
lotRoutes.post('/:id/unhold', edit, async (req, res) => {
  res.json(await unholdLot(id(req.params), parse(ReasonInput, req.body).reason, actorOf(req)))
})
lotRoutes.post('/:id/close', edit, async (req, res) => {
  res.json(await closeLot(id(req.params), actorOf(req)))
})
lotRoutes.get('/:id/units', read, async (req, res) => {
  res.json(await listLotUnits(id(req.params)))
})
lotRoutes.get('/:id/grid', read, async (req, res) => {
  res.json(await lotGrid(id(req.params)))
})
lotRoutes.get('/:id/documents', read, async (req, res) => {
  res.json(await listLotDocuments(id(req.params)))
})
lotRoutes.post('/:id/documents', edit, async (req, res) => {
  const input = parse(DocumentRequestInput, req.body)
  res.status(201).json(await requestLotDocument(id(req.params), input, actorOf(req)))
})
