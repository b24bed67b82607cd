import { IdParam } from '../../shared/schemas/common'
import { StationCreateInput, StationUpdateInput } from '../../shared/schemas/stations'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createStation, listStations, updateStation } from '../services/admin'
import { apiRoutes } from './registry'

export const stationRoutes = apiRoutes('/stations')

stationRoutes.get('/', 'signed_in', async (_req, res) => {
  res.json(await listStations())
})

stationRoutes.post('/', ['admin'], async (req, res) => {
  const input = parse(StationCreateInput, req.body)
  res.status(201).json(await createStation(input, actorOf(req)))
})

stationRoutes.patch('/:id', ['admin'], async (req, res) => {
  const input = parse(StationUpdateInput, req.body)
  res.json(await updateStation(parse(IdParam, req.params.id), input, actorOf(req)))
})
