import { StepRunInput } from '../../shared/schemas/lots'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { countersignLimiters } from '../middleware/rateLimits'
import { parse } from '../middleware/validate'
import { recordStepRun } from '../services/floor'
import { apiRoutes } from './registry'

export const stepRunRoutes = apiRoutes('/step-runs')

// 201 for a new step run; 200 with the first answer when the same clientEventId comes again.
// A scan carrying a second signature counts against the password limits; others pass.
stepRunRoutes.post('/', PERMISSIONS.recordStepRuns, ...countersignLimiters(), async (req, res) => {
  const recorded = await recordStepRun(parse(StepRunInput, req.body), actorOf(req))
  // recordStepRun asks for the alert check itself, so bench imports reach alerts at once too.
  res.status(recorded.isRepeat ? 200 : 201).json(recorded.body)
})
