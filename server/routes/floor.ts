import { z } from 'zod'
import { text } from '../../shared/schemas/common'
import { StepRunInput } from '../../shared/schemas/lots'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { countersignLimiters } from '../middleware/rateLimits'
import { parse } from '../middleware/validate'
import { floorComponentLot, floorUnit, recentRuns } from '../services/floor'
import { recordStepRun } from '../services/floor'
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

export const stepRunRoutes = apiRoutes('/step-runs')

// 201 for a new step run; 200 with the first answer when the same clientEventId comes again.
// A scan carrying a second signature counts against the password limits; others pass.
stepRunRoutes.post('/', PERMISSIONS.recordStepRuns, ...countersignLimiters(), async (req, res) => {
  const recorded = await recordStepRun(parse(StepRunInput, req.body), actorOf(req))
  // recordStepRun asks for the alert check itself, so bench imports reach alerts at once too.
  res.status(recorded.isRepeat ? 200 : 201).json(recorded.body)
})
