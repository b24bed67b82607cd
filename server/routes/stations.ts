import { StationCreateInput, StationUpdateInput } from '../../shared/schemas/stations'
import { createStation, listStations, updateStation } from '../services/admin'
import { changeHandler, createHandler } from './handlers'
import { apiRoutes } from './registry'

export const stationRoutes = apiRoutes('/stations')

stationRoutes.get('/', 'signed_in', async (_req, res) => {
  res.json(await listStations())
})

stationRoutes.post('/', ['admin'], createHandler(StationCreateInput, createStation))

stationRoutes.patch('/:id', ['admin'], changeHandler(StationUpdateInput, updateStation))
