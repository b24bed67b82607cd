import { z } from 'zod'
import { text } from '../../shared/schemas/common'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import {
  floorComponentLot,
  floorUnit,
  recentRuns,
  waitingUnits,
  whereUnitWaits,
} from '../services/floor'
import { apiRoutes } from './registry'

export const floorRoutes = apiRoutes('/floor')
const use = PERMISSIONS.useFloor

floorRoutes.get('/units/:serial', use, async (req, res) => {
  const { station } = parse(z.object({ station: text().min(1, 'which station?') }), req.query)
  res.json(await floorUnit(String(req.params.serial), station))
})
floorRoutes.get('/component-lots/:code', use, async (req, res) => {
  const { bomLineId } = parse(z.object({ bomLineId: text().uuid('which line?') }), req.query)
  res.json(await floorComponentLot(String(req.params.code), bomLineId))
})
floorRoutes.get('/stations/:code/recent', use, async (req, res) => {
  res.json(await recentRuns(String(req.params.code)))
})
floorRoutes.get('/stations/:code/waiting', use, async (req, res) => {
  const { lotId } = parse(
    z.object({ lotId: text().uuid('not a valid lot id').optional() }),
    req.query,
  )
  res.json(await waitingUnits(String(req.params.code), lotId ?? null))
})
floorRoutes.get('/units/:serial/where', use, async (req, res) => {
  res.json(await whereUnitWaits(String(req.params.serial)))
})
