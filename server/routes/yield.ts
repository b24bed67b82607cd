import { IdParam } from '../../shared/schemas/common'
import { YieldSummaryQuery } from '../../shared/schemas/yield'
import { LotStatisticsQuery, ProductStatisticsQuery } from '../../shared/schemas/statistics'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import { lotTurnDeviation } from '../services/quality'
import { getLotYield, summarizeYield } from '../services/quality'
import { getLotYieldDetail } from '../services/quality'
import { lotStatistics, productStatistics } from '../services/quality'
import { queryHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const yieldRoutes = apiRoutes('/yield')
const read = PERMISSIONS.readYield

yieldRoutes.get('/summary', read, queryHandler(YieldSummaryQuery, summarizeYield))
yieldRoutes.get('/lots/:id', read, readHandler(getLotYield))
yieldRoutes.get('/lots/:id/detail', read, readHandler(getLotYieldDetail))
yieldRoutes.get('/lots/:id/turns', read, readHandler(lotTurnDeviation))
yieldRoutes.get('/lots/:id/statistics', read, async (req, res) => {
  res.json(await lotStatistics(parse(IdParam, req.params.id), parse(LotStatisticsQuery, req.query)))
})
yieldRoutes.get('/statistics', read, queryHandler(ProductStatisticsQuery, productStatistics))
