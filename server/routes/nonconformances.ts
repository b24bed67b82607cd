import { z } from 'zod'
import { IdParam, text } from '../../shared/schemas/common'
import { DispositionInput } from '../../shared/schemas/lots'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf, signedInUser } from '../middleware/access'
import { countersignLimiters } from '../middleware/rateLimits'
import { parse } from '../middleware/validate'
import { disposeNonconformance, listNonconformances } from '../services/quality'
import { queryHandler } from './handlers'
import { apiRoutes } from './registry'

export const nonconformanceRoutes = apiRoutes('/nonconformances')

const Query = z.object({
  lotId: text().uuid().optional(),
  serial: text().max(40).optional(),
  status: z.enum(['open', 'closed']).optional(),
})

nonconformanceRoutes.get(
  '/',
  PERMISSIONS.readNonconformances,
  queryHandler(Query, listNonconformances),
)
nonconformanceRoutes.post(
  '/:id/disposition',
  PERMISSIONS.disposeNonconformances,
  ...countersignLimiters(),
  async (req, res) => {
    const actor = { ...actorOf(req), role: signedInUser(req).role }
    res.json(
      await disposeNonconformance(
        parse(IdParam, req.params.id),
        parse(DispositionInput, req.body),
        actor,
      ),
    )
  },
)
